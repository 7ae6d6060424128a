import type { ReviewEvent } from '../../../../shared/api/review.ts';
import { formatDateTime } from '../../../lib/format.ts';

const VERB: Record<ReviewEvent['action'], string> = {
  request: 'requested review',
  approve: 'approved',
  'request-changes': 'requested changes',
  reset: 'edited the study; it returned to draft',
};

/** The review history, oldest first: who did what to which revision, with their message kept as plain text. */
export function ReviewEvents({ events }: { events: ReviewEvent[] }) {
  if (events.length === 0) return <p className="text-[13px] text-ink-muted">No review yet.</p>;
  return (
    <ol aria-label="Review history" className="flex flex-col gap-2 text-[13px]">
      {events.map((e) => (
        <li key={e.id} className="border-l-2 border-rule pl-2">
          <p>
            <span className="font-semibold">{e.actor.name}</span> {VERB[e.action]}
            {e.revision !== null ? (
              <>
                {' '}
                {e.action === 'reset' ? '(was' : '—'} revision <span className="num">{e.revision}</span>
                {e.action === 'reset' ? `, ${e.fromStatus.replace('-', ' ')})` : ''}
              </>
            ) : null}
            {e.action === 'request' && e.reviewers.length > 0 ? <> from {e.reviewers.map((r) => r.name).join(', ')}</> : null}
          </p>
          {e.action === 'approve' && e.acknowledgedViolations ? (
            <p className="text-[12px] text-danger">
              <span aria-hidden="true">▲ </span>
              Approved acknowledging {e.acknowledgedViolations === 1 ? '1 violation' : `${e.acknowledgedViolations} violations`} of that revision.
            </p>
          ) : null}
          <p className="num text-[12px] text-ink-muted">
            <time dateTime={e.at}>{formatDateTime(e.at)}</time>
          </p>
          {e.message ? <p className="mt-0.5 whitespace-pre-wrap break-words">{e.message}</p> : null}
        </li>
      ))}
    </ol>
  );
}
