import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DemoInfo } from '../../../../shared/api/auth.ts';
import { api } from '../../../lib/api-client.ts';

/** GET /api/auth/demo (public): the demo accounts while demo mode is on. */
export function getDemoAccounts(): Promise<DemoInfo> {
  return api.get<DemoInfo>('/api/auth/demo');
}

export function demoAccountsQueryOptions() {
  return queryOptions({ queryKey: ['auth', 'demo'] as const, queryFn: getDemoAccounts, staleTime: Infinity });
}

export function useDemoAccounts() {
  return useQuery(demoAccountsQueryOptions());
}
