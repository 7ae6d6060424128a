import { Link, useLocation, useNavigate } from 'react-router';
import { AuthFrame, AuthPanel } from '../../features/auth/components/auth-frame.tsx';
import { ConfirmSignUp } from '../../features/auth/components/confirm-sign-up.tsx';

/** /sign-up/confirm#<token>: the link of the sign-up mail (the token stays in the fragment, out of server logs and Referer). */
export function ConfirmSignUpRoute() {
  const { hash } = useLocation();
  const navigate = useNavigate();
  return (
    <AuthFrame>
      <AuthPanel title="Finish signing up">
        <ConfirmSignUp token={hash.replace(/^#/, '')} onSignedUp={() => navigate('/', { replace: true })} />
        <p className="mt-4 text-[13px] text-ink-muted">
          <Link to="/sign-in" className="font-semibold text-accent underline underline-offset-2">
            Sign in
          </Link>{' '}
          or{' '}
          <Link to="/sign-up" className="font-semibold text-accent underline underline-offset-2">
            sign up again
          </Link>
        </p>
      </AuthPanel>
    </AuthFrame>
  );
}
