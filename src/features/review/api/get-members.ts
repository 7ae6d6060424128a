import { queryOptions, useQuery } from '@tanstack/react-query';
import type { TeamResponse } from '../../../../shared/api/team.ts';
import { api } from '../../../lib/api-client.ts';
import { reviewKeys } from './keys.ts';

/** GET /api/team: the members to choose reviewers from and to resolve @mentions against. */
export function getMembers(signal?: AbortSignal): Promise<TeamResponse> {
  return api.get<TeamResponse>('/api/team', { signal });
}

export function membersQueryOptions() {
  return queryOptions({ queryKey: reviewKeys.members(), queryFn: ({ signal }) => getMembers(signal), staleTime: 60_000 });
}

export function useMembers() {
  return useQuery(membersQueryOptions());
}
