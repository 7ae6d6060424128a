import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Me, SignInRequest } from '../../../../shared/api/auth.ts';
import { api } from '../../../lib/api-client.ts';
import { authKeys } from '../../../lib/auth.ts';

/** POST /api/auth/sign-in: sets the session cookie and answers with the signed-in identity. */
export function signIn(body: SignInRequest): Promise<Me> {
  return api.post<Me>('/api/auth/sign-in', body);
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (me) => {
      // A new session: nothing cached from before may leak into it.
      queryClient.clear();
      queryClient.setQueryData(authKeys.me(), me);
    },
  });
}
