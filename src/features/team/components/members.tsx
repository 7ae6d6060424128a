import { useState } from 'react';
import { ROLES, type Role } from '../../../../shared/api/common.ts';
import type { Member } from '../../../../shared/api/team.ts';
import { RoleBadge } from '../../../components/badges.tsx';
import { Button } from '../../../components/button.tsx';
import { ConfirmDialog } from '../../../components/dialog.tsx';
import { controlClass } from '../../../components/field.tsx';
import { Notice } from '../../../components/notice.tsx';
import { ROLE_LABEL } from '../../../lib/authorization.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { useRemoveMember } from '../api/remove-member.ts';
import { useUpdateMemberRole } from '../api/update-member-role.ts';

/** Team members with their roles; an owner changes roles and removes members here. */
export function Members({ members, meId, canManage }: { members: Member[]; meId: string; canManage: boolean }) {
  const updateRole = useUpdateMemberRole();
  const remove = useRemoveMember();
  const [rowError, setRowError] = useState<{ userId: string; message: string } | null>(null);
  const [toRemove, setToRemove] = useState<Member | null>(null);

  function changeRole(member: Member, role: Role) {
    setRowError(null);
    updateRole.mutate(
      { userId: member.userId, role },
      { onError: (error) => setRowError({ userId: member.userId, message: error.message }) },
    );
  }

  return (
    <section aria-labelledby="members-title" className="rounded-[4px] border border-rule bg-panel">
      <h2 id="members-title" className="border-b border-rule px-4 py-2 text-[13px] uppercase tracking-wide text-ink-muted">
        Members <span className="num">({members.length})</span>
      </h2>
      {/* A narrow screen scrolls the table, never the page. */}
      <div className="relative overflow-x-auto">
      <table className="w-full border-collapse text-sm">
        <thead>
          <tr className="border-b border-rule-strong text-left text-[12px] uppercase tracking-wide text-ink-muted">
            <th scope="col" className="px-4 py-1.5 font-semibold">Name</th>
            <th scope="col" className="px-2 py-1.5 font-semibold">E-mail</th>
            <th scope="col" className="px-2 py-1.5 font-semibold">Role</th>
            <th scope="col" className="px-2 py-1.5 font-semibold">Joined</th>
            {canManage ? <th scope="col" className="px-2 py-1.5"><span className="sr-only">Actions</span></th> : null}
          </tr>
        </thead>
        <tbody>
          {members.map((m) => (
            <tr key={m.userId} className="border-b border-rule align-top last:border-b-0">
              <td className="px-4 py-1.5 font-semibold whitespace-nowrap">
                {m.name}
                {m.userId === meId ? <span className="ml-1 font-normal text-ink-muted">(you)</span> : null}
              </td>
              <td className="num px-2 py-1.5 text-[13px]">{m.email}</td>
              <td className="px-2 py-1.5">
                {canManage ? (
                  <select
                    aria-label={`Role of ${m.name}`}
                    className={`${controlClass} w-28`}
                    value={m.role}
                    disabled={updateRole.isPending && updateRole.variables?.userId === m.userId}
                    onChange={(e) => changeRole(m, e.target.value as Role)}
                  >
                    {ROLES.map((r) => (
                      <option key={r} value={r}>
                        {ROLE_LABEL[r]}
                      </option>
                    ))}
                  </select>
                ) : (
                  <RoleBadge role={m.role} />
                )}
                {rowError?.userId === m.userId ? (
                  <p role="alert" className="mt-1 max-w-64 text-[12px] text-danger">
                    <span aria-hidden="true">✕ </span>
                    {rowError.message}
                  </p>
                ) : null}
              </td>
              <td className="num px-2 py-1.5 text-[13px] whitespace-nowrap">{formatDateTime(m.joinedAt)}</td>
              {canManage ? (
                <td className="px-2 py-1.5 text-right">
                  <Button size="sm" variant="danger" aria-label={`Remove ${m.name} from the team`} onClick={() => { remove.reset(); setToRemove(m); }}>
                    Remove
                  </Button>
                </td>
              ) : null}
            </tr>
          ))}
        </tbody>
      </table>
      </div>
      {updateRole.isSuccess && !rowError ? (
        <div className="px-4 pb-3 pt-1">
          <Notice tone="ok" role="status" title="Role changed." />
        </div>
      ) : null}
      <ConfirmDialog
        open={toRemove !== null}
        title="Remove this member?"
        confirmLabel="Remove member"
        busy={remove.isPending}
        error={remove.error?.message}
        onCancel={() => setToRemove(null)}
        onConfirm={() => toRemove && remove.mutate(toRemove.userId, { onSuccess: () => setToRemove(null) })}
      >
        <p>
          <span className="font-semibold">{toRemove?.name}</span> ({toRemove?.email}) loses access to the team's studies at once. Their past changes keep their name.
        </p>
      </ConfirmDialog>
    </section>
  );
}
