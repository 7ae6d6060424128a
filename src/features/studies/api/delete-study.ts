import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';

/** DELETE /api/studies/:id (engineer, owner): a soft delete; 204. */
export function deleteStudy(id: string): Promise<void> {
  return api.delete(`/api/studies/${encodeURIComponent(id)}`);
}

export function useDeleteStudy() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteStudy,
    onSuccess: (_data, id) => {
      queryClient.removeQueries({ queryKey: ['studies', 'detail', id] });
      return queryClient.invalidateQueries({ queryKey: ['studies', 'list'] });
    },
  });
}
