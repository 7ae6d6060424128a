import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useRef } from 'react';
import type { ReviewState } from '../../../../shared/api/review.ts';
import { useReview } from './get-review.ts';
import { useStudyRecord } from './get-study-record.ts';
import { reviewKeys } from './keys.ts';

/**
 * The review state, kept in step with the study record. A save from the workspace replaces the
 * cached study (`['studies', 'detail', id]`) with the server's answer, whose status may have moved
 * (a save returns a reviewed study to draft); the review, revisions and diffs cached under it are
 * then stale. When the study's edit version moves, they are refetched, and until the review
 * arrives the status shown is the study's own (the newer of the two answers wins), so the page
 * never says CHANGES REQUESTED about a study the save just made a draft.
 */
export function useLiveReview(studyId: string): ReturnType<typeof useReview> {
  const queryClient = useQueryClient();
  const study = useStudyRecord(studyId);
  const review = useReview(studyId);
  const version = study.data?.version;
  const seen = useRef(version);
  useEffect(() => {
    if (version === undefined) return;
    if (seen.current !== undefined && seen.current !== version) {
      void queryClient.invalidateQueries({ queryKey: reviewKeys.study(studyId), predicate: (q) => q.queryKey.length > reviewKeys.study(studyId).length });
    }
    seen.current = version;
  }, [queryClient, studyId, version]);
  const status = study.data?.status;
  // Whichever answer is newer tells the status: the review after a review action, the study after a save.
  if (!review.data || !status || review.data.status === status || review.dataUpdatedAt >= study.dataUpdatedAt) return review;
  const data: ReviewState = { ...review.data, status };
  return { ...review, data } as ReturnType<typeof useReview>;
}
