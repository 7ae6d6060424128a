/**
 * Sign-in state for every request: lucia sessions, the caller's team and role, role checks and
 * the same-origin rule. Routes use `requireUser` / `requireRole(min)`; nothing else touches lucia.
 */
import { eq, sql } from 'drizzle-orm';
import type { NextFunction, Request, RequestHandler, Response } from 'express';
import type { Session, User } from 'lucia';
import { roleAtLeast, type Role } from '../../shared/api/common.ts';
import type { Db } from '../db/index.ts';
import { memberships, sessions, teams, users } from '../db/schema.ts';
import { AppError } from '../errors.ts';
import type { AuthLucia } from './lucia.ts';

/** Who is calling: the user, their team and role. Services take this instead of `req`. */
export interface Actor {
  userId: string;
  name: string;
  email: string;
  teamId: string;
  teamName: string;
  role: Role;
}

declare global {
  namespace Express {
    interface Locals {
      user: User | null;
      session: Session | null;
      actor: Actor | null;
      /** Random id of the request (X-Request-Id), used in log lines. */
      requestId: string;
    }
  }
}

/** Loads the team and role of a user (null when the user belongs to no team). */
export async function loadActor(db: Db, user: { id: string; name: string; email: string }): Promise<Actor | null> {
  const rows = await db
    .select({ teamId: memberships.teamId, role: memberships.role, teamName: teams.name })
    .from(memberships)
    .innerJoin(teams, eq(teams.id, memberships.teamId))
    .where(eq(memberships.userId, user.id))
    .limit(1);
  const m = rows[0];
  return m ? { userId: user.id, name: user.name, email: user.email, teamId: m.teamId, teamName: m.teamName, role: m.role } : null;
}

/** Shape of the session ids lucia issues (40 lower-case base32 characters); anything else is not looked up. */
const SESSION_ID_RE = /^[a-z0-9]{20,64}$/;

/** Reads the session cookie, validates it (refreshing or clearing the cookie as lucia asks) and fills `res.locals`. */
export function sessionMiddleware(db: Db, lucia: AuthLucia, { maxDays, idleHours }: { maxDays: number; idleHours: number }): RequestHandler {
  const maxMs = maxDays * 24 * 60 * 60 * 1000;
  const idleMs = idleHours * 60 * 60 * 1000;
  // Built once: the SQL of the one query every signed-in request makes is not assembled again each time.
  const sessionQuery = db
    .select({
      id: sessions.id,
      userId: sessions.userId,
      expiresAt: sessions.expiresAt,
      createdAt: sessions.createdAt,
      name: users.name,
      email: users.email,
      teamId: memberships.teamId,
      role: memberships.role,
      teamName: teams.name,
    })
    .from(sessions)
    .innerJoin(users, eq(users.id, sessions.userId))
    .leftJoin(memberships, eq(memberships.userId, sessions.userId))
    .leftJoin(teams, eq(teams.id, memberships.teamId))
    .where(eq(sessions.id, sql.placeholder('id')))
    .limit(1)
    .prepare('session_by_id');
  return async (req, res, next) => {
    res.locals.user = null;
    res.locals.session = null;
    res.locals.actor = null;
    let sessionId: string | null = null;
    try {
      sessionId = lucia.readSessionCookie(req.headers.cookie ?? '');
    } catch {
      sessionId = ''; // an undecodable cookie header: no session, and the cookie is cleared below
    }
    if (sessionId === null) return next();
    if (!SESSION_ID_RE.test(sessionId)) {
      // Not an id this server ever issued (NUL, broken Unicode, wrong length): no session, and the cookie is cleared.
      res.appendHeader('Set-Cookie', lucia.createBlankSessionCookie().serialize());
      return next();
    }
    // One query for the session, its user and their team and role (lucia's validateSession and a
    // separate team lookup took two on every request); lucia's rules are kept: an expired session
    // is deleted, one in the second half of its idle span is renewed and its cookie re-sent.
    const [row] = await sessionQuery.execute({ id: sessionId });
    const now = Date.now();
    if (!row || row.expiresAt.getTime() <= now || now - row.createdAt.getTime() > maxMs) {
      // Unknown, idle past its expiry, or past the absolute maximum however recently used.
      if (row) await db.delete(sessions).where(eq(sessions.id, row.id));
      res.appendHeader('Set-Cookie', lucia.createBlankSessionCookie().serialize());
      return next();
    }
    let expiresAt = row.expiresAt;
    let fresh = false;
    if (row.expiresAt.getTime() - idleMs / 2 <= now) {
      expiresAt = new Date(now + idleMs);
      fresh = true;
      await db.update(sessions).set({ expiresAt }).where(eq(sessions.id, row.id));
      res.appendHeader('Set-Cookie', lucia.createSessionCookie(row.id).serialize());
    }
    res.locals.user = { id: row.userId, name: row.name, email: row.email };
    res.locals.session = { id: row.id, userId: row.userId, expiresAt, fresh, createdAt: row.createdAt };
    res.locals.actor =
      row.teamId && row.role && row.teamName !== null
        ? { userId: row.userId, name: row.name, email: row.email, teamId: row.teamId, teamName: row.teamName, role: row.role }
        : null;
    next();
  };
}

/** Methods that change nothing; every other method must prove it comes from the app itself. */
const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * The same-origin rule for state-changing requests (POST, PATCH, PUT, DELETE): the Origin header
 * must be the configured APP_URL, compared by scheme, host and port (a URL's origin); a request
 * without Origin passes only when the browser vouches for it with `Sec-Fetch-Site: same-origin`.
 * Anything else is 403 `foreign-origin`: another site, another port or scheme, `Origin: null`,
 * and clients that send neither header (scripts must send the app's Origin). Browsers send Origin
 * on every cross-origin request and on same-origin POST/PATCH/DELETE fetches.
 */
export function originCheck(appUrl: string): RequestHandler {
  const appOrigin = new URL(appUrl).origin;
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) return next();
    const origin = req.headers.origin;
    if (origin !== undefined) {
      let given: string | null = null;
      try {
        given = new URL(origin).origin;
      } catch {
        // not a URL (e.g. "null" from a sandboxed frame or a file:// page)
      }
      if (given !== null && given !== 'null' && given === appOrigin) return next();
      return next(new AppError(403, 'foreign-origin', 'Requests from other sites are refused.'));
    }
    if (req.headers['sec-fetch-site'] === 'same-origin') return next();
    next(new AppError(403, 'foreign-origin', 'Requests that change data must come from the app itself (send the app\'s Origin header).'));
  };
}

/** The signed-in actor of a request, or 401 / 403. */
export function actorOf(res: Response): Actor {
  if (!res.locals.user) throw new AppError(401, 'unauthenticated', 'Sign in to continue.');
  if (!res.locals.actor) throw new AppError(403, 'forbidden', 'This account does not belong to a team.');
  return res.locals.actor;
}

/** Middleware: the caller must be signed in and a member of a team. */
export const requireUser: RequestHandler = (_req: Request, res: Response, next: NextFunction) => {
  actorOf(res);
  next();
};

/** Middleware: the caller's role must be at least `min` (owner > engineer > reviewer > viewer). */
export function requireRole(min: Role): RequestHandler {
  return (_req, res, next) => {
    const actor = actorOf(res);
    if (!roleAtLeast(actor.role, min)) {
      throw new AppError(403, 'forbidden', `Your role (${actor.role}) does not allow this; it needs ${min} or above.`);
    }
    next();
  };
}
