import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Comment, CreateCommentRequest, UpdateCommentRequest } from '../../../../shared/api/comments.ts';
import { api } from '../../../lib/api-client.ts';
import { reviewKeys, studyPath } from './keys.ts';

/** POST /api/studies/:id/comments (reviewer and above): a new thread or a reply. */
export function createComment(id: string, body: CreateCommentRequest): Promise<Comment> {
  return api.post<Comment>(`${studyPath(id)}/comments`, body);
}

/** PATCH /api/studies/:id/comments/:commentId: edit own text, or resolve/reopen a thread. */
export function updateComment(id: string, commentId: string, body: UpdateCommentRequest): Promise<Comment> {
  return api.patch<Comment>(`${studyPath(id)}/comments/${encodeURIComponent(commentId)}`, body);
}

/** DELETE /api/studies/:id/comments/:commentId: the author or an owner; the thread keeps its place. */
export function deleteComment(id: string, commentId: string): Promise<void> {
  return api.delete(`${studyPath(id)}/comments/${encodeURIComponent(commentId)}`);
}

function useRefresh(id: string) {
  const queryClient = useQueryClient();
  return () => queryClient.invalidateQueries({ queryKey: reviewKeys.comments(id) });
}

export function useCreateComment(id: string) {
  const refresh = useRefresh(id);
  return useMutation({ mutationFn: (body: CreateCommentRequest) => createComment(id, body), onSuccess: refresh });
}

export function useUpdateComment(id: string) {
  const refresh = useRefresh(id);
  return useMutation({
    mutationFn: ({ commentId, body }: { commentId: string; body: UpdateCommentRequest }) => updateComment(id, commentId, body),
    onSuccess: refresh,
  });
}

export function useDeleteComment(id: string) {
  const refresh = useRefresh(id);
  return useMutation({ mutationFn: (commentId: string) => deleteComment(id, commentId), onSuccess: refresh });
}
