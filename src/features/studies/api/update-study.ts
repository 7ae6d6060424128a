import { useMutation, useQueryClient } from '@tanstack/react-query';
import { versionConflictBodySchema, type StudyDetail, type UpdateStudyRequest } from '../../../../shared/api/studies.ts';
import { api, isApiError } from '../../../lib/api-client.ts';

/** PATCH /api/studies/:id with the version the user edited; a stale version answers 409 with the current study. */
export function updateStudy(id: string, body: UpdateStudyRequest): Promise<StudyDetail> {
  return api.patch<StudyDetail>(`/api/studies/${encodeURIComponent(id)}`, body);
}

/** The study as saved by someone else, when `error` is a version conflict; otherwise null. */
export function conflictCurrent(error: unknown): StudyDetail | null {
  if (!isApiError(error, 409) || error.code !== 'version-conflict') return null;
  const parsed = versionConflictBodySchema.safeParse(error.body);
  return parsed.success ? parsed.data.current : null;
}

export function useUpdateStudy(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: UpdateStudyRequest) => updateStudy(id, body),
    onSuccess: (study) => {
      queryClient.setQueryData(['studies', 'detail', id], study);
      return queryClient.invalidateQueries({ queryKey: ['studies', 'list'] });
    },
    // On a conflict the page's record shows the saved version at once; the form keeps the user's edits.
    onError: (error) => {
      const current = conflictCurrent(error);
      if (current) {
        queryClient.setQueryData(['studies', 'detail', id], current);
        return queryClient.invalidateQueries({ queryKey: ['studies', 'list'] });
      }
    },
  });
}
