import { useState } from 'react';
import { Link, useNavigate } from 'react-router';
import type { Role } from '../../../../shared/api/common.ts';
import { Button, buttonClass } from '../../../components/button.tsx';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { useRevisions } from '../api/get-revisions.ts';
import { canWrite } from '../utils/permissions.ts';
import { RestoreDialog } from './restore-dialog.tsx';
import { RevisionResults } from './revision-results.tsx';
import { StudyCrumbs } from './study-crumbs.tsx';
import { useDocumentTitle } from '../../../lib/document-title.ts';
import { useStudyRecord } from '../api/get-study-record.ts';

/** Every saved revision, newest first: open any read-only, compare with the previous, restore (write roles). */
export function HistoryPage({ studyId, role }: { studyId: string; role: Role }) {
  const revisions = useRevisions(studyId);
  useDocumentTitle('History', useStudyRecord(studyId).data?.name);
  const navigate = useNavigate();
  const [restoring, setRestoring] = useState<number | null>(null);
  const latest = revisions.data?.items[0]?.number;

  return (
    <div className="mx-auto flex max-w-6xl flex-col gap-4">
      <StudyCrumbs studyId={studyId}>History</StudyCrumbs>
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="flex-1 text-xl">History</h1>
        <Link to={`/studies/${studyId}/diff`} className={buttonClass('secondary')}>
          Compare revisions
        </Link>
      </div>
      {revisions.isPending ? <Loading label="Loading the history…" /> : null}
      {revisions.isError ? <Notice tone="error" title="The history could not be loaded.">{revisions.error.message}</Notice> : null}
      {revisions.data && revisions.data.items.length === 0 ? <Notice>No revision has been saved yet.</Notice> : null}
      {revisions.data && revisions.data.items.length > 0 ? (
        <div className="relative overflow-x-auto rounded-[4px] border border-rule bg-panel">
          <table aria-label="Revisions" className="w-full border-collapse text-[13px] [&_td]:border-t [&_td]:border-rule [&_td]:px-3 [&_td]:py-1.5 [&_td]:align-top [&_th]:px-3 [&_th]:py-1.5 [&_th]:text-left [&_th]:font-semibold [&_th]:text-ink-muted">
            <thead>
              <tr>
                <th scope="col">Revision</th>
                <th scope="col">Message</th>
                <th scope="col">Author</th>
                <th scope="col">Saved</th>
                <th scope="col">Engine</th>
                <th scope="col">Results</th>
                <th scope="col">
                  <span className="sr-only">Actions</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {revisions.data.items.map((r) => (
                <tr key={r.number}>
                  <td className="num">
                    {r.number}
                    {r.number === latest ? <span className="ml-1 text-ink-muted">(latest)</span> : null}
                  </td>
                  <td className="max-w-md break-words">
                    {r.message || <span className="text-ink-muted">No message</span>}
                    {r.restoredFrom !== null ? <span className="block text-ink-muted">Restored from revision {r.restoredFrom}</span> : null}
                  </td>
                  <td>{r.author.name}</td>
                  <td className="num whitespace-nowrap">
                    <time dateTime={r.createdAt}>{formatDateTime(r.createdAt)}</time>
                  </td>
                  <td className="num">{r.engineVersion}</td>
                  <td>
                    <RevisionResults results={r.results} />
                  </td>
                  <td className="whitespace-nowrap">
                    <span className="flex gap-1.5">
                      <Link to={`/studies/${studyId}/revisions/${r.number}`} className={buttonClass('ghost', 'sm')} aria-label={`Open revision ${r.number}`}>
                        Open
                      </Link>
                      {r.number > 1 ? (
                        <Link to={`/studies/${studyId}/diff?from=${r.number - 1}&to=${r.number}`} className={buttonClass('ghost', 'sm')} aria-label={`Compare revision ${r.number} with ${r.number - 1}`}>
                          Compare
                        </Link>
                      ) : null}
                      {canWrite(role) && r.number !== latest ? (
                        <Button size="sm" onClick={() => setRestoring(r.number)} aria-label={`Restore revision ${r.number}`}>
                          Restore
                        </Button>
                      ) : null}
                    </span>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      {restoring !== null ? (
        <RestoreDialog studyId={studyId} n={restoring} open onClose={() => setRestoring(null)} onRestored={() => navigate(`/studies/${studyId}`)} />
      ) : null}
    </div>
  );
}
