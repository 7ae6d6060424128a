import { useState } from 'react';
import { Link, useNavigate } from 'react-router';
import type { Role } from '../../../../shared/api/common.ts';
import { StatusBadge, TemplateBadge } from '../../../components/badges.tsx';
import { Button } from '../../../components/button.tsx';
import { ConfirmDialog } from '../../../components/dialog.tsx';
import { RiskNotice } from '../../../components/risk-notice.tsx';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import { can } from '../../../lib/authorization.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { useCloneStudy } from '../api/clone-study.ts';
import { useDeleteStudy } from '../api/delete-study.ts';
import { useStudy } from '../api/get-study.ts';
import { ContentSummaryPanel } from './content-summary-panel.tsx';
import { StudyLoadError } from './study-load-error.tsx';
import { StudyDetailsForm } from './study-details-form.tsx';
import { useDocumentTitle } from '../../../lib/document-title.ts';

/** One study: its record (who, when, revision, origin), content summary, and the edits the role allows. */
export function StudyPage({ id, role }: { id: string; role: Role }) {
  const study = useStudy(id);
  useDocumentTitle(study.data?.name);
  const navigate = useNavigate();
  const remove = useDeleteStudy();
  const clone = useCloneStudy();
  const [editing, setEditing] = useState(false);
  const [confirmDelete, setConfirmDelete] = useState(false);
  const [confirmStart, setConfirmStart] = useState(false);
  const canEdit = can(role, 'study:edit');

  if (study.isPending) return <Loading label="Loading the study…" />;
  if (study.isError) return <StudyLoadError error={study.error} />;
  const s = study.data;
  const dangerous = s.isTemplate && s.risk !== null && s.risk !== undefined && (!s.risk.solved || s.risk.violationCount > 0);
  const copy = () => clone.mutate({ id: s.id }, { onSuccess: (created) => navigate(`/studies/${created.id}`) });

  return (
    <div className="mx-auto flex max-w-6xl flex-col gap-4">
      <nav aria-label="Breadcrumb" className="text-[13px] text-ink-muted">
        <Link to="/" className="text-accent hover:underline">
          Studies
        </Link>{' '}
        <span aria-hidden="true">/</span> <span>{s.name}</span>
      </nav>

      <div className="flex flex-wrap items-start gap-3">
        <div className="min-w-0 flex-1">
          <h1 className="text-xl break-words">{s.name}</h1>
          <p className="mt-1 flex flex-wrap items-center gap-2">
            <StatusBadge status={s.status} />
            {s.isTemplate ? <TemplateBadge /> : null}
            {s.revision ? <span className="num text-[13px] text-ink-muted">revision {s.revision}</span> : null}
          </p>
        </div>
        {canEdit && !editing ? (
          <div className="flex gap-2">
            <Button onClick={() => setEditing(true)}>Edit details</Button>
            <Button
              busy={clone.isPending}
              busyText={s.isTemplate ? 'Starting…' : 'Cloning…'}
              onClick={() => (dangerous ? setConfirmStart(true) : copy())}
            >
              {s.isTemplate ? 'Start from template' : 'Clone'}
            </Button>
            <Button variant="danger" onClick={() => { remove.reset(); setConfirmDelete(true); }}>
              Delete
            </Button>
          </div>
        ) : null}
      </div>
      {clone.isError ? <Notice tone="error" title={`Could not copy the study: ${clone.error.message}`} /> : null}

      <div className="grid grid-cols-[minmax(0,1fr)] gap-4 md:grid-cols-[minmax(0,1fr)_20rem]">
        <section aria-labelledby="about-title" className="rounded-[4px] border border-rule bg-panel px-4 py-3">
          <h2 id="about-title" className="sr-only">
            About this study
          </h2>
          {editing ? (
            <StudyDetailsForm key={s.id} study={s} onDone={() => setEditing(false)} />
          ) : s.description ? (
            <p className="whitespace-pre-wrap text-sm">{s.description}</p>
          ) : (
            <p className="text-sm text-ink-muted">No description.</p>
          )}
        </section>
        <section aria-labelledby="record-title" className="rounded-[4px] border border-rule bg-panel px-4 py-3">
          <h2 id="record-title" className="text-[12px] uppercase tracking-wide text-ink-muted">
            Record
          </h2>
          <dl className="mt-1 grid grid-cols-[max-content_1fr] gap-x-3 gap-y-1 text-[13px]">
            <dt className="text-ink-muted">Created</dt>
            <dd>
              {s.createdBy.name}
              <br />
              <time dateTime={s.createdAt} className="num">{formatDateTime(s.createdAt)}</time>
            </dd>
            <dt className="text-ink-muted">Last changed</dt>
            <dd>
              {s.updatedBy.name}
              <br />
              <time dateTime={s.updatedAt} className="num">{formatDateTime(s.updatedAt)}</time>
            </dd>
            <dt className="text-ink-muted">Revision</dt>
            <dd className="num">{s.revision ?? '—'}</dd>
            <dt className="text-ink-muted">Cloned from</dt>
            <dd>
              {s.clonedFrom ? (
                <Link to={`/studies/${s.clonedFrom.id}`} className="text-accent hover:underline">
                  {s.clonedFrom.name}
                </Link>
              ) : (
                '—'
              )}
            </dd>
          </dl>
        </section>
      </div>

      {s.isTemplate && s.risk ? <RiskNotice risk={s.risk} compact /> : null}
      <ContentSummaryPanel circuit={s.content.circuit} workspaceHref={`/studies/${s.id}`} />

      <ConfirmDialog
        open={confirmStart}
        title={`Start from “${s.name}”?`}
        confirmLabel="Start a new study anyway"
        busy={clone.isPending}
        onCancel={() => setConfirmStart(false)}
        onConfirm={copy}
      >
        <p className="mb-2">The new study copies this template's circuit, with these results:</p>
        {s.risk ? <RiskNotice risk={s.risk} /> : null}
      </ConfirmDialog>

      <ConfirmDialog
        open={confirmDelete}
        title="Delete this study?"
        confirmLabel="Delete study"
        busy={remove.isPending}
        error={remove.error?.message}
        onCancel={() => setConfirmDelete(false)}
        onConfirm={() => remove.mutate(s.id, { onSuccess: () => navigate('/', { replace: true }) })}
      >
        <p>
          “<span className="font-semibold">{s.name}</span>” will disappear from the team's list. Its history stays in the audit trail.
        </p>
      </ConfirmDialog>
    </div>
  );
}
