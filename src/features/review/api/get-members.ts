import { useQuery } from '@tanstack/react-query';
import { teamQueryOptions } from '../../../lib/api/team.ts';

/** The members to choose reviewers from and to resolve @mentions against: the one GET /api/team client (src/lib/api/team.ts). */
export function membersQueryOptions() {
  return teamQueryOptions();
}

export function useMembers() {
  return useQuery(teamQueryOptions());
}
