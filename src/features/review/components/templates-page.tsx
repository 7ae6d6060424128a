import { Link, useNavigate } from 'react-router';
import type { Role } from '../../../../shared/api/common.ts';
import type { StudySummary } from '../../../../shared/api/studies.ts';
import { TemplateBadge } from '../../../components/badges.tsx';
import { Button } from '../../../components/button.tsx';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import { formatDateTime, plural } from '../../../lib/format.ts';
import { useReview } from '../api/get-review.ts';
import { useNewFromTemplate, useTemplates } from '../api/templates.ts';
import { canWrite } from '../utils/permissions.ts';

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

function TemplateCard({ t, role }: { t: StudySummary; role: Role }) {
  const start = useNewFromTemplate();
  const navigate = useNavigate();
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
      </article>
      {canWrite(role) ? (
        <Button
          variant="primary"
          aria-label={`New study from template ${t.name}`}
          busy={start.isPending}
          busyText="Starting…"
          onClick={() => start.mutate({ id: t.id }, { onSuccess: (created) => navigate(`/studies/${created.id}`) })}
        >
          New from template
        </Button>
      ) : null}
      {start.isError ? <Notice tone="error">{start.error.message}</Notice> : null}
    </li>
  );
}

/** The team's templates as cards: name, description, who approved, element count, and "New from template". */
export function TemplatesPage({ role }: { role: Role }) {
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
