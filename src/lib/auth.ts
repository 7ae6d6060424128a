/**
 * Who is signed in: the `GET /api/auth/me` query and `POST /api/auth/sign-out`.
 * Kept in lib (not a feature) because every feature and the app layout read the current role.
 */
import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Me } from '../../shared/api/auth.ts';
import { api } from './api-client.ts';

export const authKeys = {
  all: ['auth'] as const,
  me: () => [...authKeys.all, 'me'] as const,
};

/** Fetches the signed-in user, team and role; rejects with a 401 ApiError when signed out. */
export function getMe(): Promise<Me> {
  return api.get<Me>('/api/auth/me');
}

export function meQueryOptions() {
  return queryOptions({ queryKey: authKeys.me(), queryFn: getMe, staleTime: 60_000, retry: false });
}

/** The signed-in identity; only used under the signed-in layout, whose loader already ensured it. */
export function useMe() {
  return useQuery(meQueryOptions());
}

/** Signs out and forgets every cached answer (they belonged to that session). */
export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api.post<void>('/api/auth/sign-out'),
    onSettled: () => {
      queryClient.clear();
    },
  });
}
