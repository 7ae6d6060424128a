/** Sign-in throttling (API contract): 5 failed attempts per account and 20 per address, each per 15 minutes. */
import { RateLimiterMemory, type RateLimiterRes } from 'rate-limiter-flexible';
import { AppError } from '../errors.ts';

export const ACCOUNT_FAILURES = 5;
export const ADDRESS_FAILURES = 20;
export const WINDOW_SECONDS = 15 * 60;

export interface SignInLimiter {
  /** Throws 429 `rate-limited` when the account or the address has used up its failed attempts. */
  check(email: string, ip: string): Promise<void>;
  /** Records one failed attempt for both the account and the address. */
  fail(email: string, ip: string): Promise<void>;
  /** Forgets the account's failures after a successful sign-in. */
  succeed(email: string): Promise<void>;
}

/** Creates an in-memory limiter (one per app instance; a restart forgets the counts). */
export function createSignInLimiter(): SignInLimiter {
  const byAccount = new RateLimiterMemory({ keyPrefix: 'acct', points: ACCOUNT_FAILURES, duration: WINDOW_SECONDS });
  const byAddress = new RateLimiterMemory({ keyPrefix: 'ip', points: ADDRESS_FAILURES, duration: WINDOW_SECONDS });

  const refuse = (res: RateLimiterRes) => {
    const retryAfterSeconds = Math.max(1, Math.ceil(res.msBeforeNext / 1000));
    const minutes = Math.ceil(retryAfterSeconds / 60);
    return new AppError(
      429,
      'rate-limited',
      `Too many failed sign-in attempts. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`,
      { retryAfterSeconds },
    );
  };

  return {
    async check(email, ip) {
      const [acct, addr] = await Promise.all([byAccount.get(email), byAddress.get(ip)]);
      if (acct && acct.consumedPoints >= ACCOUNT_FAILURES) throw refuse(acct);
      if (addr && addr.consumedPoints >= ADDRESS_FAILURES) throw refuse(addr);
    },
    async fail(email, ip) {
      // consume() rejects once the points are used up; the next check() reports that.
      await Promise.allSettled([byAccount.consume(email), byAddress.consume(ip)]);
    },
    async succeed(email) {
      await byAccount.delete(email);
    },
  };
}
