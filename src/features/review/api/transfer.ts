import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreatedStudy } from '../../../../shared/api/studies.ts';
import { api } from '../../../lib/api-client.ts';
import { studyPath } from './keys.ts';

/** Where a study's `.wyeward.json` file downloads from (GET /api/studies/:id/export). */
export function exportUrl(id: string): string {
  return `${studyPath(id)}/export`;
}

/** POST /api/studies/import (write roles): a study file or a bare circuit file → a new study; 400 lists fields by path. */
export function importStudy(file: unknown, name?: string): Promise<CreatedStudy> {
  return api.post<CreatedStudy>('/api/studies/import', file, { query: { name } });
}

export function useImportStudy() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ file, name }: { file: unknown; name?: string }) => importStudy(file, name),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['studies', 'list'] }),
  });
}
