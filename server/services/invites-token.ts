/** Invite tokens: 32 random bytes in the link, only their SHA-256 in the database. */
import { createHash, randomBytes } from 'node:crypto';

/** A new URL-safe invite token. */
export function newInviteToken(): string {
  return randomBytes(32).toString('base64url');
}

/** The stored form of a token (hex SHA-256). */
export function hashInviteToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}
