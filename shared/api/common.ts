/**
 * Shapes shared by every resource of the HTTP API (/work/notes/api.md is the contract these follow).
 * Used by the server routes and the client alike.
 */
import { z } from 'zod';

/** Team roles, most powerful first. */
export const ROLES = ['owner', 'engineer', 'reviewer', 'viewer'] as const;
export const roleSchema = z.enum(ROLES);
export type Role = z.infer<typeof roleSchema>;

/** Rank of a role: a higher number may do everything a lower one may. */
export const ROLE_RANK: Record<Role, number> = { owner: 4, engineer: 3, reviewer: 2, viewer: 1 };

/** True when `role` is at least `min` (owner > engineer > reviewer > viewer). */
export function roleAtLeast(role: Role, min: Role): boolean {
  return ROLE_RANK[role] >= ROLE_RANK[min];
}

/** Stable machine-readable error codes of the contract. */
export const ERROR_CODES = [
  'validation',
  'unauthenticated',
  'invalid-credentials',
  'forbidden',
  'not-found',
  'conflict',
  'version-conflict',
  'rate-limited',
  'foreign-origin',
  'payload-too-large',
  'unsupported-media-type',
  'unavailable',
  'internal',
] as const;
export type ErrorCode = (typeof ERROR_CODES)[number];

/** The body of every error response: `{ error: { code, message, fields?, retryAfterSeconds? } }`. */
export const errorBodySchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    fields: z.record(z.string(), z.string()).optional(),
    retryAfterSeconds: z.number().optional(),
  }),
});
export type ErrorBody = z.infer<typeof errorBodySchema>;

/** An e-mail address as typed by a person: trimmed and lower-cased before it is checked. */
export const emailSchema = z
  .string()
  .trim()
  .toLowerCase()
  .pipe(z.email({ message: 'Enter a valid e-mail address' }).max(254, 'E-mail address is too long'));

/** A person's display name. */
export const personNameSchema = z.string().trim().min(1, 'Name is required').max(100, 'Name is at most 100 characters');

/** A reference to a person shown next to a record ("created by", "invited by"). */
export const userRefSchema = z.object({ id: z.string(), name: z.string() });
export type UserRef = z.infer<typeof userRefSchema>;

/** Timestamps travel as ISO 8601 strings (UTC). */
export const isoDateSchema = z.string();

/**
 * The danger of one revision, in short (shared/review/risk.ts computes it): whether it solves,
 * its violation and warning counts, and the worst violation in the words of the diagram.
 */
export const revisionRiskSchema = z.object({
  revision: z.number().int(),
  solved: z.boolean(),
  violationCount: z.number().int(),
  warningCount: z.number().int(),
  worst: z.string().nullable(),
  error: z.string().nullable(),
});
