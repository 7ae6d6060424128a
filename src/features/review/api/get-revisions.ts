import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RevisionListResponse } from '../../../../shared/api/revisions.ts';
import { api } from '../../../lib/api-client.ts';
import { reviewKeys, studyPath } from './keys.ts';

/** GET /api/studies/:id/revisions: the history, newest first. */
export function getRevisions(id: string, signal?: AbortSignal): Promise<RevisionListResponse> {
  return api.get<RevisionListResponse>(`${studyPath(id)}/revisions`, { signal });
}

export function revisionsQueryOptions(id: string) {
  return queryOptions({ queryKey: reviewKeys.revisions(id), queryFn: ({ signal }) => getRevisions(id, signal) });
}

export function useRevisions(id: string) {
  return useQuery(revisionsQueryOptions(id));
}
