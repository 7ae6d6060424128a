/**
 * The one client of `PATCH /api/studies/:id` (used by the studies details form, the workspace save
 * and the template switch): the fetcher, the reading of a version conflict, and the cache update
 * every caller makes on success.
 */
import type { QueryClient } from '@tanstack/react-query';
import { versionConflictBodySchema, type StudyDetail, type UpdateStudyRequest } from '../../../shared/api/studies.ts';
import { api, isApiError } from '../api-client.ts';

/** Query key of one study's detail (the studies feature's `['studies', 'detail', id]`). */
export function studyDetailKey(id: string) {
  return ['studies', 'detail', id] as const;
}

/** PATCH /api/studies/:id with the version the user edited; a stale version answers 409 with the current study. */
export function patchStudy(id: string, body: UpdateStudyRequest): Promise<StudyDetail> {
  return api.patch<StudyDetail>(`/api/studies/${encodeURIComponent(id)}`, body);
}

/** The study as saved by someone else, when `error` is a version conflict; otherwise null. */
export function conflictOf(error: unknown): StudyDetail | null {
  if (!isApiError(error, 409) || error.code !== 'version-conflict') return null;
  const parsed = versionConflictBodySchema.safeParse(error.body);
  return parsed.success ? parsed.data.current : null;
}

/** After a successful patch: the cached study is the answer, and lists refetch. */
export function studyPatched(queryClient: QueryClient, study: StudyDetail): Promise<void> {
  queryClient.setQueryData(studyDetailKey(study.id), study);
  return queryClient.invalidateQueries({ queryKey: ['studies', 'list'] });
}
