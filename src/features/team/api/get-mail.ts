import { queryOptions, useQuery } from '@tanstack/react-query';
import type { MailListResponse } from '../../../../shared/api/mail.ts';
import { api } from '../../../lib/api-client.ts';

/** GET /api/mail (owner): messages the server sent, newest first. */
export function getMail(signal?: AbortSignal): Promise<MailListResponse> {
  return api.get<MailListResponse>('/api/mail', { signal });
}

export function mailQueryOptions() {
  return queryOptions({ queryKey: ['mail', 'list'] as const, queryFn: ({ signal }) => getMail(signal) });
}

export function useMail() {
  return useQuery(mailQueryOptions());
}
