import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MailMessage } from '../../../../shared/api/mail.ts';
import { api } from '../../../lib/api-client.ts';

/** GET /api/mail/:id (owner): one outgoing message with its text. */
export function getMailMessage(id: string, signal?: AbortSignal): Promise<MailMessage> {
  return api.get<MailMessage>(`/api/mail/${encodeURIComponent(id)}`, { signal });
}

export function mailMessageQueryOptions(id: string) {
  return queryOptions({ queryKey: ['mail', 'detail', id] as const, queryFn: ({ signal }) => getMailMessage(id, signal), staleTime: Infinity });
}

export function useMailMessage(id: string | null) {
  return useQuery({ ...mailMessageQueryOptions(id ?? ''), enabled: id !== null });
}
