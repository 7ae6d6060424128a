import { useCallback, useEffect, useRef, useState } from 'react';
import { useNavigate, useSearchParams } from 'react-router';
import type { ListStudiesQuery, StudySummary } from '../../../../shared/api/studies.ts';
import { Button } from '../../../components/button.tsx';
import { ConfirmDialog } from '../../../components/dialog.tsx';
import { RiskNotice } from '../../../components/risk-notice.tsx';
import { controlClass } from '../../../components/field.tsx';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import type { Role } from '../../../../shared/api/common.ts';
import { can } from '../../../lib/authorization.ts';
import { plural } from '../../../lib/format.ts';
import { useCloneStudy } from '../api/clone-study.ts';
import { useDeleteStudy } from '../api/delete-study.ts';
import { parseStudyListParams, useStudies } from '../api/get-studies.ts';
import { NewStudyDialog } from './new-study-dialog.tsx';
import { StudiesTable } from './studies-table.tsx';
import { useDocumentTitle } from '../../../lib/document-title.ts';

/** The studies page: filter, templates toggle, the table, paging, and the create/clone/delete actions the role allows. */
export function StudiesList({ role }: { role: Role }) {
  useDocumentTitle('Studies');
  const [search, setSearch] = useSearchParams();
  const params = parseStudyListParams(search);
  const studies = useStudies(params);
  const navigate = useNavigate();
  const clone = useCloneStudy();
  const remove = useDeleteStudy();
  const [newOpen, setNewOpen] = useState(false);
  const [toDelete, setToDelete] = useState<StudySummary | null>(null);
  // A template whose revision has violations (or does not solve) is copied only after saying so.
  const [toStart, setToStart] = useState<StudySummary | null>(null);
  const [actionError, setActionError] = useState<string | null>(null);
  const canCreate = can(role, 'study:create');
  const canWrite = can(role, 'study:clone');

  /** Changes some list parameters in the address bar; any change but paging goes back to page 1. */
  const update = useCallback(
    (patch: Partial<Record<keyof ListStudiesQuery, string | null>>) => {
      setSearch(
        (prev) => {
          const next = new URLSearchParams(prev);
          for (const [key, value] of Object.entries(patch)) {
            if (value === null || value === '') next.delete(key);
            else next.set(key, value);
          }
          if (!('page' in patch)) next.delete('page');
          return next;
        },
        { replace: true },
      );
    },
    [setSearch],
  );

  const cloneMutate = clone.mutate;
  const resetRemove = remove.reset;
  const copy = useCallback(
    (study: StudySummary) => {
      setActionError(null);
      setToStart(null);
      cloneMutate(
        { id: study.id },
        {
          onSuccess: (created) => navigate(`/studies/${created.id}`),
          onError: (error) => setActionError(`Could not copy “${study.name}”: ${error.message}`),
        },
      );
    },
    [cloneMutate, navigate],
  );
  const onClone = useCallback(
    (study: StudySummary) => {
      if (study.isTemplate && study.risk && (!study.risk.solved || study.risk.violationCount > 0)) setToStart(study);
      else copy(study);
    },
    [copy],
  );
  const onDelete = useCallback(
    (study: StudySummary) => {
      setActionError(null);
      resetRemove();
      setToDelete(study);
    },
    [resetRemove],
  );

  // The filter box follows typing at once; the address (and so the request) after a short pause.
  const [filterText, setFilterText] = useState(params.q ?? '');
  const currentQ = params.q ?? '';
  const lastPushed = useRef(currentQ);
  useEffect(() => {
    // The address changed from outside (a nav link, back button): show that filter in the box.
    if (currentQ !== lastPushed.current) {
      lastPushed.current = currentQ;
      setFilterText(currentQ);
    }
  }, [currentQ]);
  useEffect(() => {
    const wanted = filterText.trim();
    if (wanted === currentQ) return;
    const timer = setTimeout(() => {
      lastPushed.current = wanted;
      update({ q: wanted });
    }, 250);
    return () => clearTimeout(timer);
  }, [filterText, currentQ, update]);

  const data = studies.data;
  const pageCount = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;

  return (
    <div className="mx-auto w-full max-w-7xl">
      <div className="flex flex-wrap items-end gap-3">
        <div>
          <h1 className="text-lg">Studies</h1>
          <p className="text-[13px] text-ink-muted">Circuit studies of your team. Templates are starting points others copy.</p>
        </div>
        <div className="ml-auto flex flex-wrap items-center gap-3">
          <input
            type="search"
            aria-label="Filter studies by name"
            placeholder="Filter by name…"
            className={`${controlClass} w-56`}
            value={filterText}
            onChange={(e) => setFilterText(e.target.value)}
          />
          <label className="flex items-center gap-1.5 text-[13px]">
            <input
              type="checkbox"
              className="h-4 w-4 accent-accent"
              checked={params.template === 'true'}
              onChange={(e) => update({ template: e.target.checked ? 'true' : null })}
            />
            Templates only
          </label>
          {canCreate ? (
            <Button variant="primary" onClick={() => setNewOpen(true)}>
              New study
            </Button>
          ) : null}
        </div>
      </div>

      {actionError ? (
        <div className="mt-3">
          <Notice tone="error" title={actionError} />
        </div>
      ) : null}

      <div className="mt-4 relative overflow-x-auto rounded-[4px] border border-rule bg-panel">
        {studies.isPending ? (
          <Loading label="Loading studies…" />
        ) : studies.isError ? (
          <div className="p-3">
            <Notice tone="error" title="The studies could not be loaded.">
              {studies.error.message}
            </Notice>
          </div>
        ) : data && data.items.length === 0 && data.total > 0 ? (
          <p className="px-3 py-6 text-center text-sm text-ink-muted">
            Page <span className="num">{data.page}</span> is past the end of the list.{' '}
            <button type="button" className="font-semibold text-accent underline underline-offset-2" onClick={() => update({ page: null })}>
              Go to the first page
            </button>
          </p>
        ) : data && data.items.length === 0 ? (
          <p className="px-3 py-6 text-center text-sm text-ink-muted">
            {params.q || params.template
              ? 'No study matches this filter.'
              : canCreate
                ? 'No studies yet. Create the first with “New study”.'
                : 'No studies yet.'}
          </p>
        ) : data ? (
          <StudiesTable
            rows={data.items}
            sort={params.sort}
            dir={params.dir}
            onSortChange={(sort, dir) => update({ sort, dir })}
            canWrite={canWrite}
            onClone={onClone}
            onDelete={onDelete}
            cloningId={clone.isPending ? clone.variables?.id : null}
          />
        ) : null}
      </div>

      {data && data.total > 0 ? (
        <nav aria-label="Pages of studies" className="mt-2 flex items-center gap-3 text-[13px] text-ink-muted">
          <span>
            <span className="num">{plural(data.total, 'study', 'studies')}</span> · page <span className="num">{data.page}</span> of{' '}
            <span className="num">{pageCount}</span>
          </span>
          <div className="ml-auto flex gap-1">
            <Button size="sm" disabled={data.page <= 1} onClick={() => update({ page: String(data.page - 1) })}>
              ← Previous page
            </Button>
            <Button size="sm" disabled={data.page >= pageCount} onClick={() => update({ page: String(data.page + 1) })}>
              Next page →
            </Button>
          </div>
        </nav>
      ) : null}

      <ConfirmDialog
        open={toStart !== null}
        title={`Start from “${toStart?.name ?? ''}”?`}
        confirmLabel="Start a new study anyway"
        busy={clone.isPending}
        onCancel={() => setToStart(null)}
        onConfirm={() => toStart && copy(toStart)}
      >
        <p className="mb-2">The new study copies this template's circuit, with these results:</p>
        {toStart?.risk ? <RiskNotice risk={toStart.risk} /> : null}
      </ConfirmDialog>
      <NewStudyDialog open={newOpen} onClose={() => setNewOpen(false)} onCreated={(created) => navigate(`/studies/${created.id}`)} />
      <ConfirmDialog
        open={toDelete !== null}
        title="Delete this study?"
        confirmLabel="Delete study"
        busy={remove.isPending}
        error={remove.error?.message}
        onCancel={() => setToDelete(null)}
        onConfirm={() => {
          if (!toDelete) return;
          remove.mutate(toDelete.id, { onSuccess: () => setToDelete(null) });
        }}
      >
        <p>
          “<span className="font-semibold">{toDelete?.name}</span>” will disappear from the team's list. Its history stays in the audit trail.
        </p>
      </ConfirmDialog>
    </div>
  );
}
