import { queryOptions, useQuery } from '@tanstack/react-query';
import type { StudyDetail } from '../../../../shared/api/studies.ts';
import { api } from '../../../lib/api-client.ts';

/** GET /api/studies/:id: the whole study with its circuit (404 when missing or another team's). */
export function getStudy(id: string, signal?: AbortSignal): Promise<StudyDetail> {
  return api.get<StudyDetail>(`/api/studies/${encodeURIComponent(id)}`, { signal });
}

export function studyQueryOptions(id: string) {
  return queryOptions({
    queryKey: ['studies', 'detail', id] as const,
    queryFn: ({ signal }) => getStudy(id, signal),
  });
}

export function useStudy(id: string) {
  return useQuery(studyQueryOptions(id));
}
