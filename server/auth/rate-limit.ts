/**
 * Sign-in and sign-up throttling that a stranger cannot turn against a user.
 *
 * - Failed sign-ins are counted per **account and source address pair**. The first
 *   FREE_FAILURES are free; after that each failure makes the pair wait 2, 4, 8 … seconds (at most
 *   MAX_WAIT_SECONDS) before its next attempt. Nobody is locked out: the same account from
 *   another address (the real user at their desk) is not slowed at all, and a success clears the pair.
 * - A per-address ceiling (SIGN_IN_ADDRESS_LIMIT failed sign-ins per ADDRESS_WINDOW_SECONDS) stops one
 *   address from guessing across many accounts; it is high enough for a whole office behind one NAT.
 * - Sign-ups are limited per address (SIGN_UP_ADDRESS_LIMIT per hour).
 *
 * Counters live in the database (rate-limiter-flexible's Drizzle store over the `auth_throttle`
 * table), so a restart keeps them. Behind a reverse proxy set TRUST_PROXY, or every request seems
 * to come from the proxy's address.
 */
import { lt } from 'drizzle-orm';
import { RateLimiterDrizzle, type RateLimiterRes } from 'rate-limiter-flexible';
import type { Db } from '../db/index.ts';
import { authThrottle } from '../db/schema.ts';
import { AppError } from '../errors.ts';

/** Failed sign-ins of one account from one address before waits start. */
export const FREE_FAILURES = 5;
/** Longest wait between attempts of one account from one address. */
export const MAX_WAIT_SECONDS = 15 * 60;
/** How long failures of a pair are remembered, from the first one. */
export const PAIR_MEMORY_SECONDS = 24 * 60 * 60;
/** Window of the per-address ceiling on failed sign-ins (the ceiling is SIGN_IN_ADDRESS_LIMIT, default 300). */
export const ADDRESS_WINDOW_SECONDS = 15 * 60;

/** Seconds a pair must wait after its `failures`-th failure: 0 up to FREE_FAILURES, then 2, 4, 8 … up to MAX_WAIT_SECONDS. */
export function backoffSeconds(failures: number): number {
  if (failures <= FREE_FAILURES) return 0;
  return Math.min(MAX_WAIT_SECONDS, 2 ** Math.min(failures - FREE_FAILURES, 20));
}

export interface SignInLimiter {
  /** Throws 429 `rate-limited` while this account must wait at this address, or the address is over its ceiling. */
  check(email: string, ip: string): Promise<void>;
  /** Records one failed attempt of the pair and of the address. */
  fail(email: string, ip: string): Promise<void>;
  /** Clears the pair after a successful sign-in. */
  succeed(email: string, ip: string): Promise<void>;
  /** Counts one sign-up from the address; throws 429 past the limit. */
  signUp(ip: string): Promise<void>;
}

function wording(seconds: number): string {
  if (seconds < 60) return `${seconds} second${seconds === 1 ? '' : 's'}`;
  const minutes = Math.ceil(seconds / 60);
  return `${minutes} minute${minutes === 1 ? '' : 's'}`;
}

function refuse(msBeforeNext: number, what: string): AppError {
  const retryAfterSeconds = Math.max(1, Math.ceil(msBeforeNext / 1000));
  return new AppError(429, 'rate-limited', `${what} Try again in ${wording(retryAfterSeconds)}.`, { retryAfterSeconds });
}

/** Creates the limiter over the database's `auth_throttle` table. */
export function createSignInLimiter(db: Db, { addressLimit, signUpLimit }: { addressLimit: number; signUpLimit: number }): SignInLimiter {
  const store = (keyPrefix: string, points: number, duration: number) =>
    new RateLimiterDrizzle({ storeClient: db, schema: authThrottle, keyPrefix, points, duration, clearExpiredByTimeout: false });
  const pairFailures = store('pair', 1_000_000, PAIR_MEMORY_SECONDS);
  const pairWait = store('wait', 1, MAX_WAIT_SECONDS);
  const address = store('ip', addressLimit, ADDRESS_WINDOW_SECONDS);
  const signUps = store('signup', signUpLimit, 60 * 60);
  const pair = (email: string, ip: string) => `${email}|${ip}`;

  return {
    async check(email, ip) {
      const [wait, addr] = await Promise.all([pairWait.get(pair(email, ip)), address.get(ip)]);
      if (wait && wait.msBeforeNext > 0) throw refuse(wait.msBeforeNext, 'Too many failed sign-in attempts for this account from here.');
      if (addr && addr.consumedPoints >= addressLimit) throw refuse(addr.msBeforeNext, 'Too many failed sign-in attempts from this address.');
    },
    async fail(email, ip) {
      const [counted] = await Promise.all([pairFailures.penalty(pair(email, ip), 1), address.penalty(ip, 1)]);
      const wait = backoffSeconds((counted as RateLimiterRes).consumedPoints);
      if (wait > 0) await pairWait.block(pair(email, ip), wait);
    },
    async succeed(email, ip) {
      await Promise.all([pairFailures.delete(pair(email, ip)), pairWait.delete(pair(email, ip))]);
    },
    async signUp(ip) {
      try {
        await signUps.consume(ip, 1);
      } catch (res) {
        if (res instanceof Error) throw res;
        throw refuse((res as RateLimiterRes).msBeforeNext, 'Too many sign-ups from this address.');
      }
    },
  };
}

/** Drops expired throttle rows (run at start; live rows expire on their own). */
export async function clearExpiredThrottles(db: Db): Promise<void> {
  await db.delete(authThrottle).where(lt(authThrottle.expire, new Date()));
}
