/** POST /api/studies/:id/balance: the fetcher and its mutation hook (the request is aborted on cancel). */
import { useMutation } from '@tanstack/react-query';
import type { BalanceRequest, BalanceResponse } from '../../../../shared/api/balancing.ts';
import { api } from '../../../lib/api-client.ts';

export function runBalance(studyId: string, body: BalanceRequest, signal?: AbortSignal): Promise<BalanceResponse> {
  return api.post<BalanceResponse>(`/api/studies/${encodeURIComponent(studyId)}/balance`, body, { signal });
}

export function useRunBalance(studyId: string) {
  return useMutation({ mutationFn: ({ body, signal }: { body: BalanceRequest; signal: AbortSignal }) => runBalance(studyId, body, signal) });
}
