import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ReviewState } from '../../../../shared/api/review.ts';
import { api } from '../../../lib/api-client.ts';
import { reviewKeys, studyPath } from './keys.ts';

/** GET /api/studies/:id/review: status, the open request, the approved revision, and every event oldest first. */
export function getReview(id: string, signal?: AbortSignal): Promise<ReviewState> {
  return api.get<ReviewState>(`${studyPath(id)}/review`, { signal });
}

export function reviewQueryOptions(id: string) {
  return queryOptions({ queryKey: reviewKeys.review(id), queryFn: ({ signal }) => getReview(id, signal) });
}

export function useReview(id: string) {
  return useQuery(reviewQueryOptions(id));
}
