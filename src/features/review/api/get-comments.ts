import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CommentListResponse } from '../../../../shared/api/comments.ts';
import { api } from '../../../lib/api-client.ts';
import { reviewKeys, studyPath } from './keys.ts';

/** GET /api/studies/:id/comments: every comment oldest first, flat (threads by parentId). */
export function getComments(id: string, signal?: AbortSignal): Promise<CommentListResponse> {
  return api.get<CommentListResponse>(`${studyPath(id)}/comments`, { signal });
}

export function commentsQueryOptions(id: string) {
  return queryOptions({ queryKey: reviewKeys.comments(id), queryFn: ({ signal }) => getComments(id, signal) });
}

export function useComments(id: string) {
  return useQuery(commentsQueryOptions(id));
}
