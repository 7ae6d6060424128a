import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { ROLES } from '../../../../shared/api/common.ts';
import { createInviteRequestSchema, type Invite } from '../../../../shared/api/team.ts';
import { Button } from '../../../components/button.tsx';
import { SelectField, TextField } from '../../../components/field.tsx';
import { Notice } from '../../../components/notice.tsx';
import { ROLE_HINT, ROLE_LABEL } from '../../../lib/authorization.ts';
import { applyServerErrors } from '../../../lib/form-errors.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { useCreateInvite } from '../api/create-invite.ts';
import { useRevokeInvite } from '../api/revoke-invite.ts';

type InviteInput = z.input<typeof createInviteRequestSchema>;
type InviteOutput = z.output<typeof createInviteRequestSchema>;

/** Owner's invite form (e-mail + role); the invite link goes out by e-mail. */
export function InviteForm() {
  const create = useCreateInvite();
  const [problem, setProblem] = useState<string | null>(null);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const form = useForm<InviteInput, unknown, InviteOutput>({
    resolver: zodResolver(createInviteRequestSchema),
    defaultValues: { email: '', role: 'engineer' },
  });
  const { errors } = form.formState;
  const role = form.watch('role');

  const onSubmit = form.handleSubmit((values) => {
    setProblem(null);
    setSentTo(null);
    create.mutate(values, {
      onSuccess: (invite) => {
        setSentTo(invite.email);
        form.reset({ email: '', role: values.role });
      },
      onError: (error) => setProblem(applyServerErrors(error, form.setError, ['email', 'role'])),
    });
  });

  return (
    <section aria-labelledby="invite-title" className="rounded-[4px] border border-rule bg-panel px-4 py-3">
      <h2 id="invite-title" className="text-[13px] uppercase tracking-wide text-ink-muted">
        Invite someone
      </h2>
      <form noValidate onSubmit={onSubmit} className="mt-2 flex flex-col gap-3">
        {problem ? <Notice tone="error" title={problem} /> : null}
        {sentTo ? (
          <Notice tone="ok" role="status" title={`Invitation sent to ${sentTo}.`}>
            The link is valid for 7 days. Its message is under Outgoing mail.
          </Notice>
        ) : null}
        <TextField label="E-mail" type="email" autoComplete="off" error={errors.email?.message} {...form.register('email')} />
        <SelectField label="Role" hint={ROLE_HINT[role as keyof typeof ROLE_HINT]} error={errors.role?.message} {...form.register('role')}>
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {ROLE_LABEL[r]}
            </option>
          ))}
        </SelectField>
        <div>
          <Button type="submit" variant="primary" busy={create.isPending} busyText="Sending…">
            Send invitation
          </Button>
        </div>
      </form>
    </section>
  );
}

/** Invitations not yet accepted, with revoke (owner). */
export function PendingInvites({ invites }: { invites: Invite[] }) {
  const revoke = useRevokeInvite();
  return (
    <section aria-labelledby="pending-title" className="rounded-[4px] border border-rule bg-panel">
      <h2 id="pending-title" className="border-b border-rule px-4 py-2 text-[13px] uppercase tracking-wide text-ink-muted">
        Pending invitations <span className="num">({invites.length})</span>
      </h2>
      {revoke.isError ? (
        <div className="px-4 pt-2">
          <Notice tone="error" title={revoke.error.message} />
        </div>
      ) : null}
      {invites.length === 0 ? (
        <p className="px-4 py-3 text-sm text-ink-muted">No invitations are waiting.</p>
      ) : (
        <ul className="divide-y divide-rule">
          {invites.map((inv) => (
            <li key={inv.id} className="flex items-center gap-3 px-4 py-2 text-[13px]">
              <div className="min-w-0 flex-1">
                <p>
                  <span className="num">{inv.email}</span> as <span className="font-semibold">{ROLE_LABEL[inv.role]}</span>
                </p>
                <p className="text-ink-muted">
                  by {inv.invitedBy.name}, expires <span className="num">{formatDateTime(inv.expiresAt)}</span>
                </p>
              </div>
              <Button
                size="sm"
                variant="danger"
                aria-label={`Revoke the invitation for ${inv.email}`}
                busy={revoke.isPending && revoke.variables === inv.id}
                busyText="Revoking…"
                onClick={() => revoke.mutate(inv.id)}
              >
                Revoke
              </Button>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
