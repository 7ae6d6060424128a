import { queryOptions, useQuery } from '@tanstack/react-query';
import type { InviteInfo } from '../../../../shared/api/team.ts';
import { api } from '../../../lib/api-client.ts';

/** GET /api/invites/:token (public): the team, role and e-mail an invite offers; 404 when unknown or expired. */
export function getInvite(token: string): Promise<InviteInfo> {
  return api.get<InviteInfo>(`/api/invites/${encodeURIComponent(token)}`);
}

export function inviteQueryOptions(token: string) {
  return queryOptions({ queryKey: ['invites', 'detail', token] as const, queryFn: () => getInvite(token) });
}

export function useInvite(token: string) {
  return useQuery(inviteQueryOptions(token));
}
