import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/** DELETE /api/team/members/:userId (owner; never the last owner). */
export function removeMember(userId: string): Promise<void> {
  return api.delete(`/api/team/members/${encodeURIComponent(userId)}`);
}

export function useRemoveMember() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: removeMember,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['team'] }),
  });
}
