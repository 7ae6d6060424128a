import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/** DELETE /api/team/invites/:id (owner): the link stops working. */
export function revokeInvite(id: string): Promise<void> {
  return api.delete(`/api/team/invites/${encodeURIComponent(id)}`);
}

export function useRevokeInvite() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: revokeInvite,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['team'] }),
  });
}
