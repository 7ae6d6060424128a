import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { PASSWORD_MIN, signUpRequestSchema, type Me } from '../../../../shared/api/auth.ts';
import { Button } from '../../../components/button.tsx';
import { TextField } from '../../../components/field.tsx';
import { Notice } from '../../../components/notice.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { applyServerErrors } from '../../../lib/form-errors.ts';
import { isPending, useSignUp } from '../api/sign-up.ts';
import { useDocumentTitle } from '../../../lib/document-title.ts';

type SignUpInput = z.input<typeof signUpRequestSchema>;
type SignUpOutput = z.output<typeof signUpRequestSchema>;

interface SignUpFormProps {
  onSignedUp: (me: Me) => void;
  /** Joining through an invite: the e-mail is the invited one and no team is created. */
  invite?: { token: string; email: string };
}

/** Creates an account: a new team with you as owner, or (with an invite) joins the inviting team. */
export function SignUpForm({ onSignedUp, invite }: SignUpFormProps) {
  useDocumentTitle(invite ? 'Join your team' : 'Create an account');
  const signUp = useSignUp();
  const [problem, setProblem] = useState<string | null>(null);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const form = useForm<SignUpInput, unknown, SignUpOutput>({
    resolver: zodResolver(signUpRequestSchema),
    defaultValues: invite
      ? { name: '', email: invite.email, password: '', inviteToken: invite.token }
      : { name: '', email: '', password: '', teamName: '' },
  });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    setProblem(null);
    signUp.mutate(values, {
      onSuccess: (answer) => (isPending(answer) ? setSentTo(answer.email) : onSignedUp(answer)),
      onError: (error) => {
        // The only 409 of sign-up is a taken address: say it at the e-mail field.
        if (isApiError(error, 409)) {
          form.setError('email', { type: 'server', message: error.message });
          return;
        }
        setProblem(applyServerErrors(error, form.setError, ['name', 'email', 'password', 'teamName']));
      },
    });
  });

  if (sentTo) {
    return (
      <Notice tone="info" title="Check your inbox">
        We sent a message to {sentTo}. Open the link in it to finish creating your account and team (it works for 24 hours). If
        the address already has an account, the message says so instead.
      </Notice>
    );
  }

  return (
    <form noValidate onSubmit={onSubmit} className="flex flex-col gap-3">
      {problem ? <Notice tone="error" title={problem} /> : null}
      <TextField label="Your name" autoComplete="name" error={errors.name?.message} {...form.register('name')} />
      <TextField
        label="E-mail"
        type="email"
        autoComplete="username"
        readOnly={Boolean(invite)}
        hint={invite ? 'The invitation was sent to this address.' : undefined}
        error={errors.email?.message}
        {...form.register('email')}
      />
      <TextField
        label="Password"
        type="password"
        autoComplete="new-password"
        hint={`At least ${PASSWORD_MIN} characters and hard to guess; a few unrelated words make a good one.`}
        error={errors.password?.message}
        {...form.register('password')}
      />
      {invite ? null : (
        <TextField
          label="Team name"
          autoComplete="organization"
          hint="A new team is created with you as its owner."
          error={errors.teamName?.message}
          {...form.register('teamName')}
        />
      )}
      <Button type="submit" variant="primary" busy={signUp.isPending} busyText="Creating account…" className="mt-1">
        {invite ? 'Join the team' : 'Create account and team'}
      </Button>
    </form>
  );
}
