import type { Role } from '../../../../shared/api/common.ts';
import { circuitNames } from '../../../../shared/review/user-names.ts';
import { useQuery } from '@tanstack/react-query';
import { revisionQueryOptions } from '../api/get-revision.ts';
import { useStudyRecord } from '../api/get-study-record.ts';
import { AttachmentsPanel } from './attachments-panel.tsx';
import { circuitElementIds, CommentsPanel, resultRowChoices } from './comments-panel.tsx';
import { ReviewPanel } from './review-panel.tsx';

/** Anchor of the review section, for the strip above the workspace. */
export const REVIEW_SECTION_ID = 'review-and-comments';

/** The review side of the study page: status and actions, comments, files. Composed beside the workspace by the route. */
export function StudyReview({ studyId, role, userId, selectedElementId }: { studyId: string; role: Role; userId: string; selectedElementId?: string | null }) {
  const study = useStudyRecord(studyId);
  const latest = study.data?.revision ?? null;
  // The latest revision's results name the rows a comment can point at.
  const revision = useQuery({ ...revisionQueryOptions(studyId, latest ?? 0), enabled: latest !== null });
  if (!study.data) return null; // the study page shows the loading and error states
  return (
    <div id={REVIEW_SECTION_ID} className="mx-auto grid w-full max-w-6xl scroll-mt-4 gap-4 lg:grid-cols-[minmax(0,1fr)_24rem]">
      <div className="flex min-w-0 flex-col gap-4">
        <CommentsPanel studyId={studyId} role={role} userId={userId} elementIds={circuitElementIds(study.data.content.circuit)} circuit={study.data.content.circuit}
          resultRows={resultRowChoices(revision.data?.summary, circuitNames(revision.data?.content.circuit))} selectedElementId={selectedElementId} />
      </div>
      <div className="flex flex-col gap-4">
        <ReviewPanel studyId={studyId} role={role} userId={userId} />
        <AttachmentsPanel studyId={studyId} role={role} userId={userId} />
      </div>
    </div>
  );
}
