import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RevisionDiff } from '../../../../shared/api/revisions.ts';
import { api } from '../../../lib/api-client.ts';
import { reviewKeys, studyPath } from './keys.ts';

/** GET /api/studies/:id/diff?from=&to=: `to` defaults to the latest revision, `from` to `to − 1`. */
export function getDiff(id: string, from?: number, to?: number, signal?: AbortSignal): Promise<RevisionDiff> {
  return api.get<RevisionDiff>(`${studyPath(id)}/diff`, { query: { from, to }, signal });
}

export function diffQueryOptions(id: string, from?: number, to?: number) {
  return queryOptions({ queryKey: reviewKeys.diff(id, from, to), queryFn: ({ signal }) => getDiff(id, from, to, signal) });
}

export function useDiff(id: string, from?: number, to?: number, enabled = true) {
  return useQuery({ ...diffQueryOptions(id, from, to), enabled });
}
