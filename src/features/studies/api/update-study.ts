import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { UpdateStudyRequest } from '../../../../shared/api/studies.ts';
import { conflictOf, patchStudy, studyDetailKey, studyPatched } from '../../../lib/api/studies.ts';

/** The details form's save through the one PATCH /api/studies/:id client (src/lib/api/studies.ts). */
export function useUpdateStudy(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: UpdateStudyRequest) => patchStudy(id, body),
    onSuccess: (study) => studyPatched(queryClient, study),
    // On a conflict the page's record shows the saved version at once; the form keeps the user's edits.
    onError: (error) => {
      const current = conflictOf(error);
      if (current) {
        queryClient.setQueryData(studyDetailKey(id), current);
        return queryClient.invalidateQueries({ queryKey: ['studies', 'list'] });
      }
    },
  });
}
