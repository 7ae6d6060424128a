import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Me, SignUpRequest } from '../../../../shared/api/auth.ts';
import { api } from '../../../lib/api-client.ts';
import { authKeys } from '../../../lib/auth.ts';

/** POST /api/auth/sign-up: a new team (teamName) or joining one (inviteToken); signs the new user in. */
export function signUp(body: SignUpRequest): Promise<Me> {
  return api.post<Me>('/api/auth/sign-up', body);
}

export function useSignUp() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signUp,
    onSuccess: (me) => {
      queryClient.clear();
      queryClient.setQueryData(authKeys.me(), me);
    },
  });
}
