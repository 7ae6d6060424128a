import { useState } from 'react';
import { Link, useNavigate } from 'react-router';
import type { Role } from '../../../../shared/api/common.ts';
import type { TemplateSummary } from '../../../../shared/api/studies.ts';
import { TemplateBadge } from '../../../components/badges.tsx';
import { Button } from '../../../components/button.tsx';
import { Dialog } from '../../../components/dialog.tsx';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import { formatDateTime, plural } from '../../../lib/format.ts';
import { useReview } from '../api/get-review.ts';
import { useNewFromTemplate, useTemplates } from '../api/templates.ts';
import { canWrite } from '../utils/permissions.ts';
import { RiskNotice } from '../../../components/risk-notice.tsx';
import { useDocumentTitle } from '../../../lib/document-title.ts';

/** Who approved the template's current revision (from its review history). */
function ApprovedBy({ studyId }: { studyId: string }) {
  const review = useReview(studyId);
  const approval = review.data ? [...review.data.events].reverse().find((e) => e.action === 'approve') : undefined;
  if (review.isPending) return <span className="text-ink-muted">…</span>;
  if (!approval) return <span className="text-ink-muted">—</span>;
  return (
    <span>
      {approval.actor.name}
      {approval.revision !== null ? <span className="text-ink-muted"> (revision {approval.revision})</span> : null}
    </span>
  );
}

/**
 * One template: what it is, who approved it, and the danger of the revision a copy starts from
 * (its violations and the worst one, with the caution). "New from template" on a revision with
 * violations first says so and asks to go on.
 */
function TemplateCard({ t, role }: { t: TemplateSummary; role: Role }) {
  const start = useNewFromTemplate();
  const navigate = useNavigate();
  const [confirming, setConfirming] = useState(false);
  const dangerous = t.risk !== null && (!t.risk.solved || t.risk.violationCount > 0);
  const go = () => start.mutate({ id: t.id }, { onSuccess: (created) => navigate(`/studies/${created.id}`) });
  return (
    <li className="flex flex-col gap-2 rounded-[4px] border border-rule bg-panel px-4 py-3">
      <article aria-labelledby={`tpl-${t.id}`} className="flex flex-1 flex-col gap-2">
        <div className="flex items-start gap-2">
          <h2 id={`tpl-${t.id}`} className="flex-1 text-base break-words">
            <Link to={`/studies/${t.id}`} className="hover:underline">
              {t.name}
            </Link>
          </h2>
          <TemplateBadge />
        </div>
        <p className="line-clamp-3 text-[13px] whitespace-pre-wrap text-ink-muted">{t.description || 'No description.'}</p>
        <dl className="mt-auto grid grid-cols-[max-content_1fr] gap-x-3 gap-y-0.5 text-[13px]">
          <dt className="text-ink-muted">Approved by</dt>
          <dd>
            <ApprovedBy studyId={t.id} />
          </dd>
          <dt className="text-ink-muted">Elements</dt>
          <dd className="num">{plural(t.elementCount, 'element')}</dd>
          <dt className="text-ink-muted">Updated</dt>
          <dd className="num">{formatDateTime(t.updatedAt)}</dd>
        </dl>
        {t.risk ? <RiskNotice risk={t.risk} compact /> : null}
      </article>
      {canWrite(role) ? (
        <Button
          variant="primary"
          aria-label={`New study from template ${t.name}`}
          busy={start.isPending}
          busyText="Starting…"
          onClick={() => (dangerous ? setConfirming(true) : go())}
        >
          New from template
        </Button>
      ) : null}
      {start.isError ? <Notice tone="error">{start.error.message}</Notice> : null}
      {confirming && t.risk ? (
        <Dialog open title={`Start from “${t.name}”?`} description="The new study copies this template's circuit, with the results below." onClose={() => setConfirming(false)} width="max-w-lg">
          <div className="flex flex-col gap-3">
            <RiskNotice risk={t.risk} />
            <div className="flex justify-end gap-2">
              <Button onClick={() => setConfirming(false)}>Cancel</Button>
              <Button variant="primary" busy={start.isPending} busyText="Starting…" onClick={go}>
                Start a new study anyway
              </Button>
            </div>
          </div>
        </Dialog>
      ) : null}
    </li>
  );
}

/** The team's templates as cards: name, description, who approved, element count, and "New from template". */
export function TemplatesPage({ role }: { role: Role }) {
  useDocumentTitle('Templates');
  const templates = useTemplates();
  return (
    <div className="mx-auto flex max-w-6xl flex-col gap-4">
      <div>
        <h1 className="text-xl">Templates</h1>
        <p className="text-[13px] text-ink-muted">Approved studies the team starts new work from. A new study copies the circuit, layout and settings and records which revision it came from.</p>
      </div>
      {templates.isPending ? <Loading label="Loading templates…" /> : null}
      {templates.isError ? <Notice tone="error" title="Templates could not be loaded.">{templates.error.message}</Notice> : null}
      {templates.data && templates.data.items.length === 0 ? (
        <Notice>No templates yet. An engineer or owner marks an approved study as a template from its page.</Notice>
      ) : null}
      {templates.data && templates.data.items.length > 0 ? (
        <ul aria-label="Templates" className="grid gap-3 sm:grid-cols-2 lg:grid-cols-3">
          {templates.data.items.map((t) => (
            <TemplateCard key={t.id} t={t} role={role} />
          ))}
        </ul>
      ) : null}
    </div>
  );
}
