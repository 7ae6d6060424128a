import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateInviteRequest, Invite } from '../../../../shared/api/team.ts';
import { api } from '../../../lib/api-client.ts';

/** POST /api/team/invites (owner): records the invite and e-mails its link; valid 7 days. */
export function createInvite(body: CreateInviteRequest): Promise<Invite> {
  return api.post<Invite>('/api/team/invites', body);
}

export function useCreateInvite() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createInvite,
    onSuccess: () => Promise.all([queryClient.invalidateQueries({ queryKey: ['team'] }), queryClient.invalidateQueries({ queryKey: ['mail'] })]),
  });
}
