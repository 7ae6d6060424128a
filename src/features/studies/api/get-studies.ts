import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { listStudiesQuerySchema, type ListStudiesQuery, type ListStudiesResponse } from '../../../../shared/api/studies.ts';
import { api } from '../../../lib/api-client.ts';

/** GET /api/studies: one page of the team's studies (q searches names; template filters templates). */
export function getStudies(params: ListStudiesQuery, signal?: AbortSignal): Promise<ListStudiesResponse> {
  return api.get<ListStudiesResponse>('/api/studies', { query: params, signal });
}

export function studiesQueryOptions(params: ListStudiesQuery) {
  return queryOptions({
    queryKey: ['studies', 'list', params] as const,
    queryFn: ({ signal }) => getStudies(params, signal),
    placeholderData: keepPreviousData,
  });
}

export function useStudies(params: ListStudiesQuery) {
  return useQuery(studiesQueryOptions(params));
}

/** Reads list parameters from the page's search string with the API's own schema; bad values fall back to defaults. */
export function parseStudyListParams(search: URLSearchParams): ListStudiesQuery {
  const raw: Record<string, string> = {};
  for (const key of ['q', 'page', 'pageSize', 'template', 'sort', 'dir']) {
    const v = search.get(key);
    if (v !== null && v !== '') raw[key] = v;
  }
  const parsed = listStudiesQuerySchema.safeParse(raw);
  if (parsed.success) return parsed.data;
  // Drop only the offending keys, keep the rest of what the user asked for.
  const bad = new Set(parsed.error.issues.map((i) => String(i.path[0])));
  const kept = Object.fromEntries(Object.entries(raw).filter(([k]) => !bad.has(k)));
  return listStudiesQuerySchema.parse(kept);
}
