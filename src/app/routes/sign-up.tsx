import { Link, useNavigate } from 'react-router';
import { AuthFrame, AuthPanel } from '../../features/auth/components/auth-frame.tsx';
import { SignUpForm } from '../../features/auth/components/sign-up-form.tsx';
import { SignedOutOnly } from './signed-out-only.tsx';

export function SignUpRoute() {
  const navigate = useNavigate();
  return (
    <SignedOutOnly>
      <AuthFrame>
        <AuthPanel title="Create an account">
          <SignUpForm onSignedUp={() => navigate('/', { replace: true })} />
          <p className="mt-4 text-[13px] text-ink-muted">
            Already have an account?{' '}
            <Link to="/sign-in" className="font-semibold text-accent underline underline-offset-2">
              Sign in
            </Link>
          </p>
        </AuthPanel>
      </AuthFrame>
    </SignedOutOnly>
  );
}
