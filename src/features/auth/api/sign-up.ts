import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Me, SignUpPending, SignUpRequest } from '../../../../shared/api/auth.ts';
import { api } from '../../../lib/api-client.ts';
import { authKeys } from '../../../lib/auth.ts';

/**
 * POST /api/auth/sign-up. Joining through an invite (inviteToken) signs the new user in (`Me`); a
 * new team answers "check your inbox" (`SignUpPending`): the mailed link finishes it.
 */
export function signUp(body: SignUpRequest): Promise<Me | SignUpPending> {
  return api.post<Me | SignUpPending>('/api/auth/sign-up', body);
}

/** True for the "check your inbox" answer of a new-team sign-up. */
export function isPending(answer: Me | SignUpPending): answer is SignUpPending {
  return 'status' in answer && answer.status === 'check-inbox';
}

export function useSignUp() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signUp,
    onSuccess: (answer) => {
      if (isPending(answer)) return;
      queryClient.clear();
      queryClient.setQueryData(authKeys.me(), answer);
    },
  });
}
