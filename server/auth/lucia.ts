/** lucia 3 set up on our Drizzle tables; the rest of the server reaches sessions only through server/auth. */
import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import { Lucia } from 'lucia';
import type { Db } from '../db/index.ts';
import { sessions, users } from '../db/schema.ts';

/** Name of the session cookie (API contract). */
export const SESSION_COOKIE = 'wyeward_session';

/** Creates the lucia instance. `secure: false` over plain http, or cookie jars drop the cookie (STACK.md E8). */
export function createLucia(db: Db, { cookieSecure }: { cookieSecure: boolean }) {
  return new Lucia(new DrizzlePostgreSQLAdapter(db, sessions, users), {
    sessionCookie: { name: SESSION_COOKIE, attributes: { secure: cookieSecure, sameSite: 'lax' } },
    getUserAttributes: (a) => ({ email: a.email, name: a.name }),
  });
}

export type AuthLucia = ReturnType<typeof createLucia>;

declare module 'lucia' {
  interface Register {
    Lucia: AuthLucia;
    DatabaseUserAttributes: { email: string; name: string };
  }
}
