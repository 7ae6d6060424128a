import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AuditListResponse, AuditQuery } from '../../../../shared/api/audit.ts';
import type { ListStudiesResponse } from '../../../../shared/api/studies.ts';
import { api } from '../../../lib/api-client.ts';
import { teamQueryOptions } from '../../../lib/api/team.ts';

export type AuditFilters = Pick<AuditQuery, 'studyId' | 'action' | 'actor'> & { page: number };

/** GET /api/audit (owners): filtered by study, action (exact or a prefix ending in "."), actor; 50 a page. */
export function getAudit(filters: AuditFilters, signal?: AbortSignal): Promise<AuditListResponse> {
  return api.get<AuditListResponse>('/api/audit', { query: filters, signal });
}

export function auditQueryOptions(filters: AuditFilters) {
  return queryOptions({ queryKey: ['audit', 'list', filters] as const, queryFn: ({ signal }) => getAudit(filters, signal), placeholderData: keepPreviousData });
}

export function useAudit(filters: AuditFilters) {
  return useQuery(auditQueryOptions(filters));
}

/** The filter choices: the team's studies (first 100 by name) and its members. */
export function useAuditChoices() {
  const studies = useQuery({
    queryKey: ['studies', 'list', { page: 1, pageSize: 100, sort: 'name', dir: 'asc' }] as const,
    queryFn: ({ signal }) => api.get<ListStudiesResponse>('/api/studies', { query: { page: 1, pageSize: 100, sort: 'name', dir: 'asc' }, signal }),
  });
  const team = useQuery(teamQueryOptions());
  return { studies, team };
}
