import { useEffect } from 'react';
import { useLocation, useSearchParams } from 'react-router';
import { controlClass } from '../../../components/field.tsx';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import { useDiff } from '../api/get-diff.ts';
import { useRevisions } from '../api/get-revisions.ts';
import { DiffView } from './diff-view.tsx';
import { StudyCrumbs } from './study-crumbs.tsx';
import { useDocumentTitle } from '../../../lib/document-title.ts';
import { useStudyRecord } from '../api/get-study-record.ts';

function readRevision(v: string | null): number | undefined {
  const n = Number(v);
  return v && Number.isInteger(n) && n >= 1 ? n : undefined;
}

/** "9", "9 and 12": the revision numbers a study does not have. */
function numbersWords(ns: number[]): string {
  return ns.length === 1 ? String(ns[0]) : `${ns.slice(0, -1).join(', ')} and ${ns[ns.length - 1]}`;
}

/** "1 to 5" when the revisions run without a gap, else "1, 2 and 4". */
function rangeWords(ns: number[]): string {
  const sorted = [...ns].sort((a, b) => a - b);
  const contiguous = sorted.every((n, i) => i === 0 || n === sorted[i - 1] + 1);
  return contiguous && sorted.length > 1 ? `${sorted[0]} to ${sorted[sorted.length - 1]}` : numbersWords(sorted);
}

/**
 * Compare two revisions (default: the latest against the one before); the choice lives in the address
 * (?from=&to=). An address from a newer to an older revision is turned round (older → newer, as every
 * comparison reads) and says so; one naming a revision the study does not have says which, compares
 * nothing, and its select shows "Choose a revision" rather than another revision as if chosen.
 */
export function DiffPage({ studyId }: { studyId: string }) {
  const [search, setSearch] = useSearchParams();
  const location = useLocation();
  const revisions = useRevisions(studyId);
  useDocumentTitle('Compare revisions', useStudyRecord(studyId).data?.name);
  const latest = revisions.data?.items[0]?.number;
  const to = readRevision(search.get('to')) ?? latest;
  const from = readRevision(search.get('from')) ?? (to !== undefined ? Math.max(1, to - 1) : undefined);
  const known = revisions.data ? new Set(revisions.data.items.map((r) => r.number)) : null;
  const missing = known ? [...new Set([from, to].filter((n): n is number => n !== undefined && !known.has(n)))] : [];
  const backwards = known !== null && missing.length === 0 && from !== undefined && to !== undefined && from > to;
  const diff = useDiff(studyId, from, to, revisions.isSuccess && to !== undefined && missing.length === 0 && !backwards);
  // What the address asked for before it was turned round (kept in the history entry, not the address).
  const turned = (location.state as { turned?: { from: number; to: number } } | null)?.turned;

  useEffect(() => {
    if (!backwards) return;
    setSearch(
      (prev) => {
        const next = new URLSearchParams(prev);
        next.set('from', String(to));
        next.set('to', String(from));
        return next;
      },
      { replace: true, state: { turned: { from, to } } },
    );
  }, [backwards, from, to, setSearch]);

  const choose = (key: 'from' | 'to', value: string) =>
    setSearch(
      (prev) => {
        const next = new URLSearchParams(prev);
        next.set(key, value);
        if (key === 'to' && !prev.get('from')) next.set('from', String(from ?? value));
        if (key === 'from' && !prev.get('to') && to !== undefined) next.set('to', String(to));
        return next;
      },
      { replace: true },
    );

  const options = (value: number | undefined) => (
    <>
      {value === undefined || !known?.has(value) ? (
        <option value="">
          Choose a revision
        </option>
      ) : null}
      {revisions.data?.items.map((r) => (
        <option key={r.number} value={r.number}>
          {r.number} — {r.message || 'no message'}
        </option>
      ))}
    </>
  );
  const shownValue = (value: number | undefined) => (value !== undefined && known?.has(value) ? value : '');

  return (
    <div className="mx-auto flex max-w-5xl flex-col gap-4">
      <StudyCrumbs studyId={studyId}>Compare revisions</StudyCrumbs>
      <h1 className="text-xl">Compare revisions</h1>
      {revisions.isPending ? <Loading label="Loading the history…" /> : null}
      {revisions.isError ? <Notice tone="error" title="The history could not be loaded.">{revisions.error.message}</Notice> : null}
      {revisions.data && revisions.data.items.length === 0 ? <Notice>This study has no saved revisions yet.</Notice> : null}
      {revisions.data && revisions.data.items.length > 0 ? (
        <div className="flex flex-wrap items-end gap-3 rounded-[4px] border border-rule bg-panel px-4 py-3">
          <label className="flex flex-col gap-1 text-[13px] font-semibold">
            From revision
            <select className={controlClass} value={backwards ? (to ?? '') : shownValue(from)} onChange={(e) => choose('from', e.target.value)}>
              {options(from)}
            </select>
          </label>
          <span aria-hidden="true" className="pb-1.5">
            →
          </span>
          <label className="flex flex-col gap-1 text-[13px] font-semibold">
            To revision
            <select className={controlClass} value={backwards ? (from ?? '') : shownValue(to)} onChange={(e) => choose('to', e.target.value)}>
              {options(to)}
            </select>
          </label>
        </div>
      ) : null}
      {missing.length > 0 && revisions.data && revisions.data.items.length > 0 ? (
        <Notice tone="error" title={`This study has no revision ${numbersWords(missing.sort((a, b) => a - b))}: its revisions are ${rangeWords([...known!])}. Choose the two to compare.`} />
      ) : null}
      {turned && !backwards && turned.to === from && turned.from === to ? (
        <p role="status" className="text-[13px] text-ink-muted">
          Revision {turned.from} is newer than revision {turned.to}, so the changes are shown from revision {from} to revision {to}.
        </p>
      ) : null}
      {diff.isPending && diff.fetchStatus !== 'idle' ? <Loading label="Comparing…" /> : null}
      {diff.isError ? <Notice tone="error" title="The comparison could not be made.">{diff.error.message}</Notice> : null}
      {diff.data ? (
        <section aria-label={`Changes from revision ${diff.data.from} to revision ${diff.data.to}`} className="rounded-[4px] border border-rule bg-panel px-4 py-3">
          <h2 className="mb-3 text-base">
            Revision <span className="num">{diff.data.from}</span> → revision <span className="num">{diff.data.to}</span>
          </h2>
          <DiffView diff={diff.data} />
        </section>
      ) : null}
    </div>
  );
}
