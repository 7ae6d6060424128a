/** Accounts: sign-up (new team, or joining by invite) and the check of credentials at sign-in. */
import { randomUUID } from 'node:crypto';
import { and, eq, gt, isNull } from 'drizzle-orm';
import type { Me, SignInRequest, SignUpRequest } from '../../shared/api/auth.ts';
import type { Actor } from '../auth/index.ts';
import { loadActor } from '../auth/index.ts';
import { hashPassword, verifyAgainstDummy, verifyPassword } from '../auth/passwords.ts';
import type { SignInLimiter } from '../auth/rate-limit.ts';
import type { Db } from '../db/index.ts';
import { invites, memberships, teams, users } from '../db/schema.ts';
import { AppError, fieldError, isUniqueViolation } from '../errors.ts';
import { recordAudit } from './audit.ts';
import { hashInviteToken } from './invites-token.ts';

/** The contract's `Me` of an actor. */
export function toMe(a: Actor): Me {
  return { user: { id: a.userId, name: a.name, email: a.email }, team: { id: a.teamId, name: a.teamName }, role: a.role };
}

const EMAIL_TAKEN = 'An account with this e-mail already exists';

/** Creates an account: a new team with the user as owner, or membership of the inviting team with the invited role. */
export async function signUp(db: Db, input: SignUpRequest): Promise<Actor> {
  const existing = await db.select({ id: users.id }).from(users).where(eq(users.email, input.email)).limit(1);
  if (existing.length > 0) throw new AppError(409, 'conflict', EMAIL_TAKEN, { fields: { email: EMAIL_TAKEN } });
  const passwordHash = await hashPassword(input.password);
  const userId = randomUUID();

  try {
    await db.transaction(async (tx) => {
      await tx.insert(users).values({ id: userId, email: input.email, name: input.name, passwordHash });
      if (input.inviteToken) {
        const [invite] = await tx
          .select()
          .from(invites)
          .where(
            and(
              eq(invites.tokenHash, hashInviteToken(input.inviteToken)),
              isNull(invites.acceptedAt),
              isNull(invites.revokedAt),
              gt(invites.expiresAt, new Date()),
            ),
          )
          .limit(1);
        if (!invite) throw fieldError('inviteToken', 'This invite is no longer valid; ask the team owner for a new one.');
        if (invite.email !== input.email) throw fieldError('email', 'Use the e-mail address the invite was sent to.');
        await tx.insert(memberships).values({ userId, teamId: invite.teamId, role: invite.role });
        await tx.update(invites).set({ acceptedAt: new Date(), acceptedBy: userId }).where(eq(invites.id, invite.id));
        await recordAudit(tx, { teamId: invite.teamId, actorId: userId, action: 'user.sign-up', detail: { email: input.email } });
        await recordAudit(tx, {
          teamId: invite.teamId,
          actorId: userId,
          action: 'invite.accept',
          detail: { inviteId: invite.id, role: invite.role },
        });
      } else {
        const [team] = await tx.insert(teams).values({ name: input.teamName! }).returning({ id: teams.id });
        await tx.insert(memberships).values({ userId, teamId: team.id, role: 'owner' });
        await recordAudit(tx, { teamId: team.id, actorId: userId, action: 'user.sign-up', detail: { email: input.email, teamCreated: true } });
      }
    });
  } catch (err) {
    // Two sign-ups racing for one address: the unique index decides.
    if (isUniqueViolation(err)) {
      throw new AppError(409, 'conflict', EMAIL_TAKEN, { fields: { email: EMAIL_TAKEN } });
    }
    throw err;
  }
  const actor = await loadActor(db, { id: userId, name: input.name, email: input.email });
  if (!actor) throw new Error('sign-up left the user without a team');
  return actor;
}

const INVALID = 'E-mail or password is incorrect.';

/**
 * Checks credentials, throttled per account and per address. Unknown e-mail and wrong password
 * get the same answer (and take about the same time).
 */
export async function verifyCredentials(db: Db, limiter: SignInLimiter, input: SignInRequest, ip: string): Promise<Actor> {
  await limiter.check(input.email, ip);
  const [user] = await db.select().from(users).where(eq(users.email, input.email)).limit(1);
  const ok = user ? await verifyPassword(user.passwordHash, input.password) : await verifyAgainstDummy(input.password);
  if (!user || !ok) {
    await limiter.fail(input.email, ip);
    throw new AppError(401, 'invalid-credentials', INVALID);
  }
  await limiter.succeed(input.email);
  const actor = await loadActor(db, user);
  if (!actor) throw new AppError(403, 'forbidden', 'This account no longer belongs to a team; ask an owner for a new invite.');
  return actor;
}
