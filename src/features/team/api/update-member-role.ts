import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Role } from '../../../../shared/api/common.ts';
import type { Member } from '../../../../shared/api/team.ts';
import { api } from '../../../lib/api-client.ts';
import { authKeys } from '../../../lib/auth.ts';

/** PATCH /api/team/members/:userId (owner): a new role; the last owner cannot be demoted (409). */
export function updateMemberRole(userId: string, role: Role): Promise<Member> {
  return api.patch<Member>(`/api/team/members/${encodeURIComponent(userId)}`, { role });
}

export function useUpdateMemberRole() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ userId, role }: { userId: string; role: Role }) => updateMemberRole(userId, role),
    // The owner may have changed their own role: refresh who-am-I as well as the team.
    onSuccess: () => Promise.all([queryClient.invalidateQueries({ queryKey: ['team'] }), queryClient.invalidateQueries({ queryKey: authKeys.all })]),
  });
}
