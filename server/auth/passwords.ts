/** Password hashing: argon2id via @node-rs/argon2 with its defaults (m=19456 KiB, t=2, p=1; OWASP's minimum for argon2id). */
import { hash, verify, type Algorithm } from '@node-rs/argon2';

const ARGON2ID = 2 as Algorithm; // Algorithm.Argon2id (a const enum, not importable as a value here)

/** Hashes a password to a PHC string. */
export function hashPassword(password: string): Promise<string> {
  return hash(password, { algorithm: ARGON2ID });
}

/** True when `password` matches the PHC string `passwordHash`. */
export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}

let dummyHash: Promise<string> | null = null;

/** Spends the time of one verification when the account does not exist, so timing does not reveal which e-mails have accounts. */
export async function verifyAgainstDummy(password: string): Promise<false> {
  dummyHash ??= hashPassword('not-a-real-password-for-timing');
  await verifyPassword(await dummyHash, password);
  return false;
}
