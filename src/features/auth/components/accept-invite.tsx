import type { Me } from '../../../../shared/api/auth.ts';
import { RoleBadge } from '../../../components/badges.tsx';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { useInvite } from '../api/get-invite.ts';
import { SignUpForm } from './sign-up-form.tsx';

/** Shows what an invite offers, then a sign-up form that joins that team with that role. */
export function AcceptInvite({ token, onSignedUp }: { token: string; onSignedUp: (me: Me) => void }) {
  const invite = useInvite(token);
  if (invite.isPending) return <Loading label="Checking the invitation…" />;
  if (invite.isError) {
    return isApiError(invite.error, 404) ? (
      <Notice tone="error" title="This invitation is not valid any more.">
        It may have expired, been revoked or been used already. Ask the team's owner to send a new one.
      </Notice>
    ) : (
      <Notice tone="error" title={invite.error.message} />
    );
  }
  const info = invite.data;
  return (
    <div className="flex flex-col gap-4">
      <dl className="grid grid-cols-[max-content_1fr] gap-x-3 gap-y-1 rounded-[3px] border border-rule bg-sunken/50 px-3 py-2 text-[13px]">
        <dt className="text-ink-muted">Team</dt>
        <dd className="font-semibold">{info.teamName}</dd>
        <dt className="text-ink-muted">Role</dt>
        <dd>
          <RoleBadge role={info.role} />
        </dd>
        <dt className="text-ink-muted">Valid until</dt>
        <dd className="num">{formatDateTime(info.expiresAt)}</dd>
      </dl>
      <SignUpForm invite={{ token, email: info.email }} onSignedUp={onSignedUp} />
    </div>
  );
}
