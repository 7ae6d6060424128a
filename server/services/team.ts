/** The team: members and roles, invites by e-mail. Owners manage; every member may read the member list. */
import { and, asc, count, desc, eq, gt, isNull } from 'drizzle-orm';
import type { Role } from '../../shared/api/common.ts';
import type { CreateInviteRequest, Invite, InviteInfo, Member, TeamResponse } from '../../shared/api/team.ts';
import type { Actor } from '../auth/index.ts';
import type { Db } from '../db/index.ts';
import { invites, memberships, sessions, teams, users } from '../db/schema.ts';
import { AppError, isUuid, notFound } from '../errors.ts';
import type { Mailer } from '../mail/index.ts';
import { recordAudit } from './audit.ts';
import { hashInviteToken, newInviteToken } from './invites-token.ts';

/** Invites are valid for 7 days (API contract). */
export const INVITE_DAYS = 7;

const ROLE_WORDS: Record<Role, string> = {
  owner: 'an owner (manages members, roles and every study)',
  engineer: 'an engineer (creates, edits and clones studies, marks templates)',
  reviewer: 'a reviewer (reads studies, comments on them, approves them or asks for changes)',
  viewer: 'a viewer (reads studies)',
};

async function membersOf(db: Db, teamId: string): Promise<Member[]> {
  const rows = await db
    .select({ userId: users.id, name: users.name, email: users.email, role: memberships.role, joinedAt: memberships.createdAt })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.teamId, teamId))
    .orderBy(asc(memberships.createdAt), asc(users.name));
  return rows.map((r) => ({ ...r, joinedAt: r.joinedAt.toISOString() }));
}

/** Invites still waiting: not accepted, not revoked, not expired. */
function pending(teamId?: string) {
  return and(teamId ? eq(invites.teamId, teamId) : undefined, isNull(invites.acceptedAt), isNull(invites.revokedAt), gt(invites.expiresAt, new Date()));
}

async function pendingInvites(db: Db, teamId: string): Promise<Invite[]> {
  const rows = await db
    .select({
      id: invites.id,
      email: invites.email,
      role: invites.role,
      createdAt: invites.createdAt,
      expiresAt: invites.expiresAt,
      invitedById: users.id,
      invitedByName: users.name,
    })
    .from(invites)
    .innerJoin(users, eq(users.id, invites.invitedBy))
    .where(pending(teamId))
    .orderBy(desc(invites.createdAt));
  return rows.map((r) => ({
    id: r.id,
    email: r.email,
    role: r.role,
    createdAt: r.createdAt.toISOString(),
    expiresAt: r.expiresAt.toISOString(),
    invitedBy: { id: r.invitedById, name: r.invitedByName },
  }));
}

/** The team, its members and (for owners only) its pending invites. */
export async function getTeam(db: Db, actor: Actor): Promise<TeamResponse> {
  return {
    team: { id: actor.teamId, name: actor.teamName },
    members: await membersOf(db, actor.teamId),
    invites: actor.role === 'owner' ? await pendingInvites(db, actor.teamId) : [],
  };
}

/** Invites someone by e-mail with a role; a newer invite to the same address replaces the older one. */
export async function createInvite(
  db: Db,
  mailer: Mailer,
  appUrl: string,
  actor: Actor,
  input: CreateInviteRequest,
): Promise<Invite> {
  const [taken] = await db.select({ id: users.id }).from(users).where(eq(users.email, input.email)).limit(1);
  if (taken) {
    throw new AppError(409, 'conflict', 'An account with this e-mail already exists; one account belongs to one team in this version.');
  }
  const token = newInviteToken();
  const expiresAt = new Date(Date.now() + INVITE_DAYS * 24 * 3600 * 1000);
  const [row] = await db.transaction(async (tx) => {
    await tx
      .update(invites)
      .set({ revokedAt: new Date() })
      .where(and(pending(actor.teamId), eq(invites.email, input.email)));
    const inserted = await tx
      .insert(invites)
      .values({ teamId: actor.teamId, email: input.email, role: input.role, tokenHash: hashInviteToken(token), invitedBy: actor.userId, expiresAt })
      .returning();
    await recordAudit(tx, {
      teamId: actor.teamId,
      actorId: actor.userId,
      action: 'invite.create',
      detail: { inviteId: inserted[0].id, email: input.email, role: input.role },
    });
    return inserted;
  });

  const link = `${appUrl}/invite/${token}`;
  await mailer.send({
    teamId: actor.teamId,
    to: input.email,
    subject: `${actor.name} invites you to ${actor.teamName} on Wyeward`,
    text: [
      `${actor.name} has invited you to join the team "${actor.teamName}" on Wyeward as ${ROLE_WORDS[input.role]}.`,
      '',
      `Create your account here (the link works once, until ${expiresAt.toUTCString()}):`,
      link,
      '',
      'If you did not expect this invitation, you can ignore this message.',
    ].join('\n'),
  });

  return {
    id: row.id,
    email: row.email,
    role: row.role,
    createdAt: row.createdAt.toISOString(),
    expiresAt: row.expiresAt.toISOString(),
    invitedBy: { id: actor.userId, name: actor.name },
  };
}

/** Withdraws a pending invite of the team. */
export async function revokeInvite(db: Db, actor: Actor, id: string): Promise<void> {
  if (!isUuid(id)) throw notFound('Invite');
  const revoked = await db
    .update(invites)
    .set({ revokedAt: new Date() })
    .where(and(pending(actor.teamId), eq(invites.id, id)))
    .returning({ email: invites.email });
  if (revoked.length === 0) throw notFound('Invite');
  await recordAudit(db, { teamId: actor.teamId, actorId: actor.userId, action: 'invite.revoke', detail: { inviteId: id, email: revoked[0].email } });
}

/** What a pending invite offers (public, by token), or 404. */
export async function inviteInfo(db: Db, token: string): Promise<InviteInfo> {
  if (token.length > 200) throw notFound('Invite');
  const [row] = await db
    .select({ email: invites.email, role: invites.role, teamName: teams.name, expiresAt: invites.expiresAt })
    .from(invites)
    .innerJoin(teams, eq(teams.id, invites.teamId))
    .where(and(eq(invites.tokenHash, hashInviteToken(token)), pending()))
    .limit(1);
  if (!row) throw notFound('Invite');
  return { email: row.email, role: row.role, teamName: row.teamName, expiresAt: row.expiresAt.toISOString() };
}

async function ownerCount(db: Db, teamId: string): Promise<number> {
  const [{ n }] = await db
    .select({ n: count() })
    .from(memberships)
    .where(and(eq(memberships.teamId, teamId), eq(memberships.role, 'owner')));
  return n;
}

async function memberOfTeam(db: Db, actor: Actor, userId: string) {
  const [m] = await db
    .select({ role: memberships.role })
    .from(memberships)
    .where(and(eq(memberships.teamId, actor.teamId), eq(memberships.userId, userId)))
    .limit(1);
  if (!m) throw notFound('Member');
  return m;
}

/** Changes a member's role; the team always keeps at least one owner. */
export async function updateMemberRole(db: Db, actor: Actor, userId: string, role: Role): Promise<Member> {
  const m = await memberOfTeam(db, actor, userId);
  if (m.role === 'owner' && role !== 'owner' && (await ownerCount(db, actor.teamId)) <= 1) {
    throw new AppError(409, 'conflict', 'The last owner cannot be demoted; make someone else an owner first.');
  }
  if (m.role !== role) {
    await db.update(memberships).set({ role }).where(eq(memberships.userId, userId));
    await recordAudit(db, { teamId: actor.teamId, actorId: actor.userId, action: 'member.role', detail: { userId, from: m.role, to: role } });
  }
  const member = (await membersOf(db, actor.teamId)).find((x) => x.userId === userId);
  if (!member) throw notFound('Member');
  return member;
}

/** Removes a member from the team and signs them out everywhere; the last owner cannot be removed. */
export async function removeMember(db: Db, actor: Actor, userId: string): Promise<void> {
  const m = await memberOfTeam(db, actor, userId);
  if (m.role === 'owner' && (await ownerCount(db, actor.teamId)) <= 1) {
    throw new AppError(409, 'conflict', 'The last owner cannot be removed; make someone else an owner first.');
  }
  await db.transaction(async (tx) => {
    await tx.delete(memberships).where(eq(memberships.userId, userId));
    await tx.delete(sessions).where(eq(sessions.userId, userId));
    await recordAudit(tx, { teamId: actor.teamId, actorId: actor.userId, action: 'member.remove', detail: { userId, role: m.role } });
  });
}
