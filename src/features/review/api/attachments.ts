import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Attachment, AttachmentListResponse } from '../../../../shared/api/attachments.ts';
import { api, ApiError, type ApiErrorBody } from '../../../lib/api-client.ts';
import { reviewKeys, studyPath } from './keys.ts';

/** GET /api/studies/:id/attachments: newest first. */
export function getAttachments(id: string, signal?: AbortSignal): Promise<AttachmentListResponse> {
  return api.get<AttachmentListResponse>(`${studyPath(id)}/attachments`, { signal });
}

export function attachmentsQueryOptions(id: string) {
  return queryOptions({ queryKey: reviewKeys.attachments(id), queryFn: ({ signal }) => getAttachments(id, signal) });
}

export function useAttachments(id: string) {
  return useQuery(attachmentsQueryOptions(id));
}

/** Where a file downloads from (same origin; the session cookie goes along). */
export function attachmentUrl(id: string, attachmentId: string): string {
  return `${studyPath(id)}/attachments/${encodeURIComponent(attachmentId)}`;
}

/**
 * POST /api/studies/:id/attachments as multipart (field `file`). The JSON api client cannot send
 * FormData, so this call builds the same typed ApiError from the contract's error body itself.
 */
export async function uploadAttachment(id: string, file: File): Promise<Attachment> {
  const form = new FormData();
  form.append('file', file, file.name);
  let res: Response;
  try {
    res = await fetch(`${studyPath(id)}/attachments`, { method: 'POST', body: form, credentials: 'same-origin', headers: { Accept: 'application/json' } });
  } catch {
    throw new ApiError(0, { code: 'network', message: 'Cannot reach the Wyeward server. Check the connection and try again.' }, null);
  }
  const text = await res.text();
  let body: unknown = null;
  try {
    body = text ? JSON.parse(text) : null;
  } catch {
    body = text;
  }
  if (!res.ok) {
    const err = (body as { error?: ApiErrorBody } | null)?.error;
    const fallback: ApiErrorBody =
      res.status === 413
        ? { code: 'payload-too-large', message: 'The file is larger than 10 MB.' }
        : { code: 'unknown', message: `The upload failed (HTTP ${res.status}).` };
    throw new ApiError(res.status, err && typeof err.message === 'string' ? err : fallback, body);
  }
  return body as Attachment;
}

/** DELETE /api/studies/:id/attachments/:attachmentId (the uploader, or engineer and above). */
export function deleteAttachment(id: string, attachmentId: string): Promise<void> {
  return api.delete(attachmentUrl(id, attachmentId));
}

export function useUploadAttachment(id: string) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: (file: File) => uploadAttachment(id, file), onSuccess: () => queryClient.invalidateQueries({ queryKey: reviewKeys.attachments(id) }) });
}

export function useDeleteAttachment(id: string) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: (attachmentId: string) => deleteAttachment(id, attachmentId), onSuccess: () => queryClient.invalidateQueries({ queryKey: reviewKeys.attachments(id) }) });
}
