import { Link } from 'react-router';
import type { Notification } from '../../../../shared/api/notifications.ts';
import { Button } from '../../../components/button.tsx';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { useMarkRead, useNotifications } from '../api/notifications.ts';
import { useDocumentTitle } from '../../../lib/document-title.ts';

const KIND: Record<Notification['kind'], string> = {
  'review-requested': 'Review requested',
  mention: 'Mention',
  'changes-requested': 'Changes requested',
  approved: 'Approved',
};

/** The signed-in member's notifications, newest first; open the study or mark them read. */
export function NotificationsPage() {
  useDocumentTitle('Notifications');
  const list = useNotifications();
  const mark = useMarkRead();
  return (
    <div className="mx-auto flex max-w-3xl flex-col gap-4">
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="flex-1 text-xl">Notifications</h1>
        {list.data && list.data.unread > 0 ? (
          <Button onClick={() => mark.mutate({})} busy={mark.isPending} busyText="Marking…">
            Mark all read
          </Button>
        ) : null}
      </div>
      {list.isPending ? <Loading label="Loading notifications…" /> : null}
      {list.isError ? <Notice tone="error" title="Notifications could not be loaded.">{list.error.message}</Notice> : null}
      {mark.isError ? <Notice tone="error">{mark.error.message}</Notice> : null}
      {list.data && list.data.items.length === 0 ? <Notice>Nothing yet. Review requests, decisions and mentions appear here.</Notice> : null}
      {list.data && list.data.items.length > 0 ? (
        <ul aria-label="Notifications" className="flex flex-col divide-y divide-rule rounded-[4px] border border-rule bg-panel">
          {list.data.items.map((n) => (
            <li key={n.id} className={`flex flex-wrap items-start gap-3 px-4 py-2.5 ${n.read ? '' : 'bg-accent-soft/50'}`}>
              <div className="min-w-0 flex-1">
                <p className="text-[12px] font-semibold uppercase tracking-wide text-ink-muted">
                  {n.read ? null : (
                    <span className="mr-1 text-accent">
                      <span aria-hidden="true">● </span>Unread ·
                    </span>
                  )}
                  {KIND[n.kind]}
                </p>
                <p className="text-sm break-words whitespace-pre-wrap">{n.text}</p>
                <p className="text-[12px] text-ink-muted">
                  {n.actor.name}, <time dateTime={n.createdAt} className="num">{formatDateTime(n.createdAt)}</time>
                  {n.study ? (
                    <>
                      {' · '}
                      <Link
                        to={`/studies/${n.study.id}`}
                        className="font-semibold text-accent hover:underline"
                        onClick={() => {
                          if (!n.read) mark.mutate({ ids: [n.id] });
                        }}
                      >
                        {n.study.name}
                      </Link>
                    </>
                  ) : null}
                </p>
              </div>
              {n.read ? null : (
                <Button size="sm" onClick={() => mark.mutate({ ids: [n.id] })} aria-label={`Mark read: ${n.text}`}>
                  Mark read
                </Button>
              )}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
