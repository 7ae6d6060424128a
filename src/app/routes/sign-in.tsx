import { Link, useNavigate, useSearchParams } from 'react-router';
import { AuthFrame } from '../../features/auth/components/auth-frame.tsx';
import { SignInForm } from '../../features/auth/components/sign-in-form.tsx';
import { safeNext } from '../safe-next.ts';
import { SignedOutOnly } from './signed-out-only.tsx';

export function SignInRoute() {
  const navigate = useNavigate();
  const [params] = useSearchParams();
  const next = safeNext(params.get('next'));
  return (
    <SignedOutOnly>
      <AuthFrame>
        <SignInForm onSignedIn={() => navigate(next, { replace: true })}>
          <p className="mt-4 text-[13px] text-ink-muted">
            New to Wyeward?{' '}
            <Link to="/sign-up" className="font-semibold text-accent underline underline-offset-2">
              Create an account and a team
            </Link>
          </p>
        </SignInForm>
      </AuthFrame>
    </SignedOutOnly>
  );
}
