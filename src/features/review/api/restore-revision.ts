import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SavedRevision } from '../../../../shared/api/revisions.ts';
import { api } from '../../../lib/api-client.ts';
import { reviewKeys, studyPath } from './keys.ts';

/** POST /api/studies/:id/revisions/:n/restore (write roles): a new revision with the content of n; stale version → 409. */
export function restoreRevision(id: string, n: number, version: number, message?: string): Promise<SavedRevision> {
  return api.post<SavedRevision>(`${studyPath(id)}/revisions/${n}/restore`, message ? { version, message } : { version });
}

export function useRestoreRevision(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ n, version, message }: { n: number; version: number; message?: string }) => restoreRevision(id, n, version, message),
    onSuccess: async (saved) => {
      queryClient.setQueryData(reviewKeys.study(id), saved.study);
      await queryClient.invalidateQueries({ queryKey: reviewKeys.study(id), predicate: (q) => q.queryKey.length > 3 });
      await queryClient.invalidateQueries({ queryKey: ['studies', 'list'] });
    },
    onError: () => queryClient.invalidateQueries({ queryKey: reviewKeys.study(id) }),
  });
}
