/** The audit trail (`/api/audit`, owner only). */
import { z } from 'zod';
import { isoDateSchema, userRefSchema } from './common.ts';

export const AUDIT_ACTIONS = [
  'user.sign-up',
  'study.create',
  'study.update',
  'study.delete',
  'study.clone',
  'study.template',
  'invite.create',
  'invite.revoke',
  'invite.accept',
  'member.role',
  'member.remove',
  'revision.create',
  'revision.restore',
  'review.request',
  'review.approve',
  'review.request-changes',
  'review.reset',
  'comment.create',
  'comment.edit',
  'comment.delete',
  'comment.resolve',
  'comment.reopen',
  'attachment.upload',
  'attachment.delete',
  'study.import',
  'study.export',
] as const;
export type AuditAction = (typeof AUDIT_ACTIONS)[number];

export const auditEventSchema = z.object({
  id: z.string(),
  at: isoDateSchema,
  actor: userRefSchema,
  action: z.string(),
  studyId: z.string().nullable(),
  detail: z.unknown(),
});
export type AuditEvent = z.infer<typeof auditEventSchema>;

export const auditQuerySchema = z.object({
  studyId: z.string().optional(),
  /** An exact action, or a prefix ending in "." (`review.`). */
  action: z.string().trim().max(100).optional(),
  /** A user id. */
  actor: z.string().trim().max(100).optional(),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;

export const auditListResponseSchema = z.object({ items: z.array(auditEventSchema), total: z.number().int() });
export type AuditListResponse = z.infer<typeof auditListResponseSchema>;

/** Events per page of GET /api/audit. */
export const AUDIT_PAGE_SIZE = 50;
