import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreatedStudy, CreateStudyRequest } from '../../../../shared/api/studies.ts';
import { api } from '../../../lib/api-client.ts';

/** POST /api/studies (engineer, owner): 201 `{ id, version }`; no content means an empty 60 Hz circuit. */
export function createStudy(body: CreateStudyRequest): Promise<CreatedStudy> {
  return api.post<CreatedStudy>('/api/studies', body);
}

export function useCreateStudy() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createStudy,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['studies', 'list'] }),
  });
}
