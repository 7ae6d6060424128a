import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CreatedStudy, StudyDetail, TemplateListResponse } from '../../../../shared/api/studies.ts';
import { api } from '../../../lib/api-client.ts';
import { patchStudy } from '../../../lib/api/studies.ts';
import { reviewKeys, studyPath } from './keys.ts';

/** GET /api/templates: approved studies marked as templates, each with the danger of the revision a copy starts from. */
export function getTemplates(signal?: AbortSignal): Promise<TemplateListResponse> {
  return api.get<TemplateListResponse>('/api/templates', { signal });
}

export function templatesQueryOptions() {
  return queryOptions({ queryKey: reviewKeys.templates(), queryFn: ({ signal }) => getTemplates(signal) });
}

export function useTemplates() {
  return useQuery(templatesQueryOptions());
}

/** PATCH /api/studies/:id { version, isTemplate } (write roles); marking a study that is not approved answers 409. */
export function setTemplate(id: string, version: number, isTemplate: boolean): Promise<StudyDetail> {
  return patchStudy(id, { version, isTemplate });
}

export function useSetTemplate(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ version, isTemplate }: { version: number; isTemplate: boolean }) => setTemplate(id, version, isTemplate),
    onSuccess: async (study) => {
      queryClient.setQueryData(reviewKeys.study(id), study);
      await Promise.all([queryClient.invalidateQueries({ queryKey: reviewKeys.templates() }), queryClient.invalidateQueries({ queryKey: ['studies', 'list'] })]);
    },
    onError: () => queryClient.invalidateQueries({ queryKey: reviewKeys.study(id), exact: true }),
  });
}

/** POST /api/studies/:id/clone: "new from template" (copies circuit, layout and settings; records the source revision). */
export function cloneFromTemplate(id: string, name?: string): Promise<CreatedStudy> {
  return api.post<CreatedStudy>(`${studyPath(id)}/clone`, name ? { name } : {});
}

export function useNewFromTemplate() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, name }: { id: string; name?: string }) => cloneFromTemplate(id, name),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ['studies', 'list'] }),
  });
}
