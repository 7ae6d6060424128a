/** Accounts: sign-up (new team, or joining by invite) and the check of credentials at sign-in. */
import { randomBytes, randomUUID } from 'node:crypto';
import { and, eq, gt, isNull, lt } from 'drizzle-orm';
import type { Me, SignInRequest, SignUpPending, SignUpRequest } from '../../shared/api/auth.ts';
import type { Actor } from '../auth/index.ts';
import { loadActor } from '../auth/index.ts';
import { hashPassword, verifyAgainstDummy, verifyPassword } from '../auth/passwords.ts';
import type { SignInLimiter } from '../auth/rate-limit.ts';
import type { Db } from '../db/index.ts';
import { invites, memberships, signUpRequests, teams, users } from '../db/schema.ts';
import type { Mailer } from '../mail/index.ts';
import { accountExistsMail, confirmSignUpMail, NO_TEAM } from '../mail/account-templates.ts';
import { passwordWeakness } from '../auth/password-strength.ts';
import { AppError, fieldError, isUniqueViolation } from '../errors.ts';
import { recordAudit } from './audit.ts';
import { hashInviteToken } from './invites-token.ts';

/** The contract's `Me` of an actor. */
export function toMe(a: Actor): Me {
  return { user: { id: a.userId, name: a.name, email: a.email }, team: { id: a.teamId, name: a.teamName }, role: a.role };
}

const EMAIL_TAKEN = 'An account with this e-mail already exists';
/** How long the link that finishes a sign-up works. */
export const SIGN_UP_LINK_HOURS = 24;

/** Refuses a password zxcvbn finds too easy to guess (400 on `password`). */
async function checkStrength(input: { password: string; name: string; email: string; teamName?: string }): Promise<void> {
  const weak = await passwordWeakness(input.password, [input.name, input.email, input.teamName ?? '']);
  if (weak) throw fieldError('password', weak);
}

/**
 * Sign-up of a new team. Whatever the address, the answer is the same ("check your inbox") and one
 * mail goes out: the link that finishes the sign-up, or, when the address already has an account,
 * a note saying so with a link to sign in. The password is hashed in both cases so the time taken
 * does not tell them apart either.
 */
export async function requestSignUp(db: Db, mailer: Mailer, appUrl: string, input: SignUpRequest): Promise<SignUpPending> {
  await checkStrength(input);
  const passwordHash = await hashPassword(input.password);
  const [existing] = await db.select({ id: users.id, name: users.name }).from(users).where(eq(users.email, input.email)).limit(1);
  let mail: { subject: string; text: string; html: string };
  if (existing) {
    mail = accountExistsMail({ name: existing.name, signInLink: `${appUrl}/sign-in` });
  } else {
    const token = randomBytes(32).toString('base64url');
    const expiresAt = new Date(Date.now() + SIGN_UP_LINK_HOURS * 3600_000);
    await db.delete(signUpRequests).where(lt(signUpRequests.expiresAt, new Date()));
    await db.insert(signUpRequests).values({
      tokenHash: hashInviteToken(token),
      email: input.email,
      name: input.name,
      teamName: input.teamName!,
      passwordHash,
      expiresAt,
    });
    mail = confirmSignUpMail({ name: input.name, teamName: input.teamName!, link: `${appUrl}/sign-up/confirm#${token}`, expiresAt });
  }
  // Not awaited: the answer must not wait for (and so time) the mail server. Failures keep a copy (mail/index.ts).
  void mailer.send({ teamId: NO_TEAM, to: input.email, ...mail }).catch(() => {});
  return { status: 'check-inbox', email: input.email };
}

/** Finishes a sign-up from its mailed link: creates the account and its team, once. */
export async function confirmSignUp(db: Db, token: string): Promise<Actor> {
  const [req] = await db
    .select()
    .from(signUpRequests)
    .where(and(eq(signUpRequests.tokenHash, hashInviteToken(token)), gt(signUpRequests.expiresAt, new Date())))
    .limit(1);
  if (!req) throw new AppError(404, 'not-found', 'This sign-up link is no longer valid; sign up again to get a new one.');
  const userId = randomUUID();
  try {
    await db.transaction(async (tx) => {
      const gone = await tx.delete(signUpRequests).where(eq(signUpRequests.id, req.id)).returning({ id: signUpRequests.id });
      if (gone.length === 0) throw new AppError(404, 'not-found', 'This sign-up link has already been used.');
      await tx.insert(users).values({ id: userId, email: req.email, name: req.name, passwordHash: req.passwordHash });
      const [team] = await tx.insert(teams).values({ name: req.teamName }).returning({ id: teams.id });
      await tx.insert(memberships).values({ userId, teamId: team.id, role: 'owner' });
      await recordAudit(tx, { teamId: team.id, actorId: userId, action: 'user.sign-up', detail: { email: req.email, teamCreated: true } });
    });
  } catch (err) {
    if (isUniqueViolation(err)) throw new AppError(409, 'conflict', `${EMAIL_TAKEN}; sign in instead.`, { fields: { email: EMAIL_TAKEN } });
    throw err;
  }
  const actor = await loadActor(db, { id: userId, name: req.name, email: req.email });
  if (!actor) throw new Error('sign-up left the user without a team');
  return actor;
}

/**
 * Joins a team through an invite. The invite was mailed to the address, so it proves the address
 * and the account is made at once.
 */
export async function signUpWithInvite(db: Db, input: SignUpRequest & { inviteToken: string }): Promise<Actor> {
  await checkStrength(input);
  const existing = await db.select({ id: users.id }).from(users).where(eq(users.email, input.email)).limit(1);
  if (existing.length > 0) throw new AppError(409, 'conflict', EMAIL_TAKEN, { fields: { email: EMAIL_TAKEN } });
  const passwordHash = await hashPassword(input.password);
  const userId = randomUUID();

  try {
    await db.transaction(async (tx) => {
      await tx.insert(users).values({ id: userId, email: input.email, name: input.name, passwordHash });
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
    });
  } catch (err) {
    // Two sign-ups racing for one address: the unique index decides.
    if (isUniqueViolation(err)) throw new AppError(409, 'conflict', EMAIL_TAKEN, { fields: { email: EMAIL_TAKEN } });
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
  await limiter.succeed(input.email, ip);
  const actor = await loadActor(db, user);
  if (!actor) throw new AppError(403, 'forbidden', 'This account no longer belongs to a team; ask an owner for a new invite.');
  return actor;
}
