import { Link } from 'react-router';
import type { Me } from '../../../../shared/api/auth.ts';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import { can, ROLE_HINT, ROLE_LABEL } from '../../../lib/authorization.ts';
import { useTeam } from '../../../lib/api/team.ts';
import { InviteForm, PendingInvites } from './invites.tsx';
import { Members } from './members.tsx';
import { useDocumentTitle } from '../../../lib/document-title.ts';

/** The team: members and roles for everyone; invitations and role changes for owners. */
export function TeamPage({ me }: { me: Me }) {
  useDocumentTitle('Team');
  const team = useTeam();
  const canManage = can(me.role, 'team:manage');
  if (team.isPending) return <Loading label="Loading the team…" />;
  if (team.isError) return <Notice tone="error" title="The team could not be loaded.">{team.error.message}</Notice>;
  const t = team.data;
  return (
    <div className="mx-auto flex max-w-6xl flex-col gap-4">
      <div>
        <h1 className="text-lg">{t.team.name}</h1>
        <p className="text-[13px] text-ink-muted">
          You are {me.role === 'owner' || me.role === 'engineer' ? 'an' : 'a'} {ROLE_LABEL[me.role].toLowerCase()}: {ROLE_HINT[me.role]}.
          {canManage ? (
            <>
              {' '}Invitation e-mails are kept under{' '}
              <Link to="/team/mail" className="font-semibold text-accent underline underline-offset-2">
                Outgoing mail
              </Link>
              .
            </>
          ) : null}
        </p>
      </div>
      <div className={canManage ? 'grid grid-cols-[minmax(0,1fr)] gap-4 lg:grid-cols-[minmax(0,1fr)_22rem]' : ''}>
        <div className="flex flex-col gap-4">
          <Members members={t.members} meId={me.user.id} canManage={canManage} />
          {canManage ? <PendingInvites invites={t.invites} /> : null}
        </div>
        {canManage ? (
          <div>
            <InviteForm />
          </div>
        ) : null}
      </div>
    </div>
  );
}
