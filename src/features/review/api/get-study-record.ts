import { queryOptions, useQuery } from '@tanstack/react-query';
import type { StudyDetail } from '../../../../shared/api/studies.ts';
import { api } from '../../../lib/api-client.ts';
import { reviewKeys, studyPath } from './keys.ts';

/** GET /api/studies/:id (the same cache entry the study page reads; features do not import each other). */
export function getStudyRecord(id: string, signal?: AbortSignal): Promise<StudyDetail> {
  return api.get<StudyDetail>(studyPath(id), { signal });
}

export function studyRecordQueryOptions(id: string) {
  return queryOptions({ queryKey: reviewKeys.study(id), queryFn: ({ signal }) => getStudyRecord(id, signal) });
}

export function useStudyRecord(id: string) {
  return useQuery(studyRecordQueryOptions(id));
}
