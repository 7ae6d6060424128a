/** The one client of `GET /api/team` (team page, reviewer choice, @mentions, audit filters): one key, one query function. */
import { queryOptions, useQuery } from '@tanstack/react-query';
import type { TeamResponse } from '../../../shared/api/team.ts';
import { api } from '../api-client.ts';

/** GET /api/team: the team, its members, and (for owners only) pending invites. */
export function getTeam(signal?: AbortSignal): Promise<TeamResponse> {
  return api.get<TeamResponse>('/api/team', { signal });
}

export function teamQueryOptions() {
  return queryOptions({ queryKey: ['team', 'overview'] as const, queryFn: ({ signal }) => getTeam(signal), staleTime: 60_000 });
}

export function useTeam() {
  return useQuery(teamQueryOptions());
}
