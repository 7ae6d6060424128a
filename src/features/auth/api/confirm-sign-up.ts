import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Me } from '../../../../shared/api/auth.ts';
import { api } from '../../../lib/api-client.ts';
import { authKeys } from '../../../lib/auth.ts';

/** POST /api/auth/sign-up/confirm: the token from the mailed link makes the account and signs it in. */
export function confirmSignUp(token: string): Promise<Me> {
  return api.post<Me>('/api/auth/sign-up/confirm', { token });
}

export function useConfirmSignUp() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: confirmSignUp,
    onSuccess: (me) => {
      queryClient.clear();
      queryClient.setQueryData(authKeys.me(), me);
    },
  });
}
