import { useEffect, useRef } from 'react';
import type { Me } from '../../../../shared/api/auth.ts';
import { Notice } from '../../../components/notice.tsx';
import { useConfirmSignUp } from '../api/confirm-sign-up.ts';

/** Finishes a sign-up from the mailed link: posts its token once and signs the new owner in. */
export function ConfirmSignUp({ token, onSignedUp }: { token: string; onSignedUp: (me: Me) => void }) {
  const confirm = useConfirmSignUp();
  const sent = useRef(false);
  useEffect(() => {
    if (sent.current || !token) return;
    sent.current = true;
    confirm.mutate(token, { onSuccess: onSignedUp });
  }, [confirm, token, onSignedUp]);

  if (!token) return <Notice tone="error" title="This link is incomplete">Open the whole link from the e-mail, or sign up again.</Notice>;
  if (confirm.isError) return <Notice tone="error" title="Your account could not be created">{confirm.error.message}</Notice>;
  return <p className="text-sm text-ink-muted">Creating your account and team…</p>;
}
