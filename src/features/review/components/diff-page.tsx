import { useSearchParams } from 'react-router';
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

/** Compare two revisions (default: the latest against the one before); the choice lives in the address (?from=&to=). */
export function DiffPage({ studyId }: { studyId: string }) {
  const [search, setSearch] = useSearchParams();
  const revisions = useRevisions(studyId);
  useDocumentTitle('Compare revisions', useStudyRecord(studyId).data?.name);
  const latest = revisions.data?.items[0]?.number;
  const to = readRevision(search.get('to')) ?? latest;
  const from = readRevision(search.get('from')) ?? (to !== undefined ? Math.max(1, to - 1) : undefined);
  const diff = useDiff(studyId, from, to, revisions.isSuccess && to !== undefined);

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
            <select className={controlClass} value={from ?? ''} onChange={(e) => choose('from', e.target.value)}>
              {revisions.data.items.map((r) => (
                <option key={r.number} value={r.number}>
                  {r.number} — {r.message || 'no message'}
                </option>
              ))}
            </select>
          </label>
          <span aria-hidden="true" className="pb-1.5">
            →
          </span>
          <label className="flex flex-col gap-1 text-[13px] font-semibold">
            To revision
            <select className={controlClass} value={to ?? ''} onChange={(e) => choose('to', e.target.value)}>
              {revisions.data.items.map((r) => (
                <option key={r.number} value={r.number}>
                  {r.number} — {r.message || 'no message'}
                </option>
              ))}
            </select>
          </label>
        </div>
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
