import { QueryCache, QueryClient } from '@tanstack/react-query';
import { isApiError } from './api-client.ts';
import { authKeys } from './auth.ts';

/** Builds the app's QueryClient: client errors (4xx) are answers, not blips, so only retry network/5xx once. */
export function createQueryClient(): QueryClient {
  const client: QueryClient = new QueryClient({
    // A 401 anywhere means the session ended: re-ask who is signed in, and the layout sends them to sign-in.
    queryCache: new QueryCache({
      onError: (error, query) => {
        if (isApiError(error, 401) && query.queryKey[0] !== authKeys.all[0]) void client.invalidateQueries({ queryKey: authKeys.me() });
      },
    }),
    defaultOptions: {
      queries: {
        staleTime: 15_000,
        refetchOnWindowFocus: false,
        retry: (failureCount, error) => {
          if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
          return failureCount < 1;
        },
      },
      mutations: { retry: false },
    },
  });
  return client;
}

/** The app-wide instance (tests make their own with createQueryClient or `retry: false`). */
export const queryClient = createQueryClient();
