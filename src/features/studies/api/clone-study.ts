import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreatedStudy } from '../../../../shared/api/studies.ts';
import { api } from '../../../lib/api-client.ts';

/** POST /api/studies/:id/clone (engineer, owner): a new draft copy; also how a study starts from a template. */
export function cloneStudy(id: string, name?: string): Promise<CreatedStudy> {
  return api.post<CreatedStudy>(`/api/studies/${encodeURIComponent(id)}/clone`, name ? { name } : {});
}

export function useCloneStudy() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, name }: { id: string; name?: string }) => cloneStudy(id, name),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['studies', 'list'] }),
  });
}
