/** lucia 3 set up on our Drizzle tables; the rest of the server reaches sessions only through server/auth. */
import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import { Lucia, TimeSpan } from 'lucia';
import type { Db } from '../db/index.ts';
import { sessions, users } from '../db/schema.ts';

/** Name of the session cookie (API contract). */
export const SESSION_COOKIE = 'wyeward_session';

/**
 * Creates the lucia instance. `secure: false` over plain http, or cookie jars drop the cookie.
 * Idle expiry: a session lasts `idleHours` from its last renewal; lucia renews it (and the cookie)
 * on a request in the second half of that span, so an unused session ends after between half and
 * all of `idleHours`. The absolute maximum (`createdAt` + SESSION_MAX_DAYS) is enforced by the
 * session middleware.
 */
export function createLucia(db: Db, { cookieSecure, idleHours }: { cookieSecure: boolean; idleHours: number }) {
  return new Lucia(new DrizzlePostgreSQLAdapter(db, sessions, users), {
    sessionExpiresIn: new TimeSpan(idleHours * 60, 'm'),
    sessionCookie: { name: SESSION_COOKIE, attributes: { secure: cookieSecure, sameSite: 'lax' } },
    getUserAttributes: (a) => ({ email: a.email, name: a.name }),
    getSessionAttributes: (a) => ({ createdAt: a.createdAt }),
  });
}

export type AuthLucia = ReturnType<typeof createLucia>;

declare module 'lucia' {
  interface Register {
    Lucia: AuthLucia;
    DatabaseUserAttributes: { email: string; name: string };
    DatabaseSessionAttributes: { createdAt: Date };
  }
}
