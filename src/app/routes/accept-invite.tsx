import { Link, useNavigate, useParams } from 'react-router';
import { AcceptInvite } from '../../features/auth/components/accept-invite.tsx';
import { AuthFrame, AuthPanel } from '../../features/auth/components/auth-frame.tsx';

export function AcceptInviteRoute() {
  const { token = '' } = useParams();
  const navigate = useNavigate();
  return (
    <AuthFrame>
      <AuthPanel title="Join a team on Wyeward">
        <AcceptInvite token={token} onSignedUp={() => navigate('/', { replace: true })} />
        <p className="mt-4 text-[13px] text-ink-muted">
          Already have an account?{' '}
          <Link to="/sign-in" className="font-semibold text-accent underline underline-offset-2">
            Sign in
          </Link>{' '}
          (one team per account in this version).
        </p>
      </AuthPanel>
    </AuthFrame>
  );
}
