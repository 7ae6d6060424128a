import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Revision } from '../../../../shared/api/revisions.ts';
import { api } from '../../../lib/api-client.ts';
import { reviewKeys, studyPath } from './keys.ts';

/** GET /api/studies/:id/revisions/:n: one immutable revision with its content and results summary. */
export function getRevision(id: string, n: number, signal?: AbortSignal): Promise<Revision> {
  return api.get<Revision>(`${studyPath(id)}/revisions/${n}`, { signal });
}

export function revisionQueryOptions(id: string, n: number) {
  // Revisions never change once written.
  return queryOptions({ queryKey: reviewKeys.revision(id, n), queryFn: ({ signal }) => getRevision(id, n, signal), staleTime: Infinity });
}

export function useRevision(id: string, n: number) {
  return useQuery(revisionQueryOptions(id, n));
}
