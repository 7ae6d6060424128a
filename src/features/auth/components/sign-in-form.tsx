import { zodResolver } from '@hookform/resolvers/zod';
import { useState, type ReactNode } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { signInRequestSchema, type Me } from '../../../../shared/api/auth.ts';
import { Button } from '../../../components/button.tsx';
import { TextField } from '../../../components/field.tsx';
import { Notice } from '../../../components/notice.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { applyServerErrors } from '../../../lib/form-errors.ts';
import { formatWait } from '../../../lib/format.ts';
import { useSignIn } from '../api/sign-in.ts';
import { DemoAccounts } from './demo-accounts.tsx';
import { useDocumentTitle } from '../../../lib/document-title.ts';

type SignInInput = z.input<typeof signInRequestSchema>;
type SignInOutput = z.output<typeof signInRequestSchema>;

interface Problem {
  title: string;
  detail?: string;
}

/** E-mail + password sign-in; shows the demo accounts beside it when demo mode is on. */
export function SignInForm({ onSignedIn, children }: { onSignedIn: (me: Me) => void; children?: ReactNode }) {
  useDocumentTitle('Sign in');
  const signIn = useSignIn();
  const [problem, setProblem] = useState<Problem | null>(null);
  const form = useForm<SignInInput, unknown, SignInOutput>({
    resolver: zodResolver(signInRequestSchema),
    defaultValues: { email: '', password: '' },
  });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    setProblem(null);
    signIn.mutate(values, {
      onSuccess: onSignedIn,
      onError: (error) => {
        if (isApiError(error, 429)) {
          const wait = error.retryAfterSeconds;
          setProblem({
            title: 'Too many sign-in attempts.',
            detail: wait ? `For your account's safety, sign-in is paused. Try again in ${formatWait(wait)}.` : error.message,
          });
          return;
        }
        const message = applyServerErrors(error, form.setError, ['email', 'password']);
        if (message) setProblem({ title: message });
      },
    });
  });

  function fillAccount(email: string, password: string) {
    form.setValue('email', email, { shouldValidate: false });
    form.setValue('password', password, { shouldValidate: false });
    form.clearErrors();
    setProblem(null);
    form.setFocus('password');
  }

  return (
    <div className="flex w-full flex-col gap-6 md:flex-row md:items-start">
      <section aria-labelledby="sign-in-title" className="w-full max-w-sm rounded-[4px] border border-rule bg-panel p-5">
        <h1 id="sign-in-title" className="mb-4 text-lg">
          Sign in to Wyeward
        </h1>
        <form noValidate onSubmit={onSubmit} className="flex flex-col gap-3">
          {problem ? (
            <Notice tone="error" title={problem.title}>
              {problem.detail}
            </Notice>
          ) : null}
          <TextField label="E-mail" type="email" autoComplete="username" error={errors.email?.message} {...form.register('email')} />
          <TextField label="Password" type="password" autoComplete="current-password" error={errors.password?.message} {...form.register('password')} />
          <Button type="submit" variant="primary" busy={signIn.isPending} busyText="Signing in…" className="mt-1">
            Sign in
          </Button>
        </form>
        {children}
      </section>
      <div className="w-full max-w-md">
        <DemoAccounts onUse={fillAccount} />
      </div>
    </div>
  );
}
