import { Link } from 'react-router';
import { StatusBadge } from '../../../components/badges.tsx';
import { buttonClass } from '../../../components/button.tsx';
import { useComments } from '../api/get-comments.ts';
import { useLiveReview } from '../api/use-live-review.ts';
import { reviewDiffHref } from '../utils/permissions.ts';
import { REVIEW_SECTION_ID } from './study-review.tsx';

/**
 * A one-line review summary above the workspace: status, the open request with a link to its diff
 * (what a reviewer reads first), and a jump to the review panel, comments and files below the canvas.
 */
export function ReviewStrip({ studyId }: { studyId: string }) {
  const review = useLiveReview(studyId);
  const comments = useComments(studyId);
  if (!review.data) return null;
  const state = review.data;
  const open = comments.data?.items.filter((c) => c.parentId === null && !c.resolved && !c.deleted).length ?? 0;
  return (
    <div role="group" aria-label="Review summary" className="mx-auto flex w-full flex-wrap items-center gap-x-3 gap-y-1 rounded-[4px] border border-rule bg-panel px-3 py-1.5 text-[13px]">
      <StatusBadge status={state.status} />
      {state.status === 'in-review' && state.review ? (
        <>
          <span>
            {state.review.requestedBy.name} asked {state.review.reviewers.map((r) => r.name).join(', ')} to review revision <span className="num">{state.review.revision}</span>.
          </span>
          <Link to={reviewDiffHref(studyId, state) ?? `/studies/${studyId}/diff`} className={buttonClass('primary', 'sm')}>
            Read the changes
          </Link>
        </>
      ) : state.status === 'approved' && state.approvedRevision !== null ? (
        <span>
          Revision <span className="num">{state.approvedRevision}</span> approved.
        </span>
      ) : null}
      <a href={`#${REVIEW_SECTION_ID}`} className="ml-auto font-semibold text-accent hover:underline">
        Review, comments ({open} open) and files <span aria-hidden="true">↓</span>
      </a>
    </div>
  );
}
