import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ReviewActionRequest, ReviewState } from '../../../../shared/api/review.ts';
import { api } from '../../../lib/api-client.ts';
import { reviewKeys, studyPath } from './keys.ts';

/** POST /api/studies/:id/review: request, approve or request changes; an illegal transition answers 409 naming the state. */
export function postReviewAction(id: string, body: ReviewActionRequest): Promise<ReviewState> {
  return api.post<ReviewState>(`${studyPath(id)}/review`, body);
}

export function useReviewAction(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: ReviewActionRequest) => postReviewAction(id, body),
    // The answer is the new state: show it and close the dialog at once; the rest refreshes behind.
    onSuccess: (state) => {
      queryClient.setQueryData(reviewKeys.review(id), state);
      void Promise.all([
        queryClient.invalidateQueries({ queryKey: reviewKeys.study(id) }),
        queryClient.invalidateQueries({ queryKey: ['studies', 'list'] }),
        queryClient.invalidateQueries({ queryKey: reviewKeys.templates() }),
        queryClient.invalidateQueries({ queryKey: ['notifications'] }),
      ]);
    },
    // A 409 means the study moved on: show the state as it is now.
    onError: () => queryClient.invalidateQueries({ queryKey: reviewKeys.study(id) }),
  });
}
