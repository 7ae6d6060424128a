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

/** Each action in words, for the trail and its filter. */
export const AUDIT_ACTION_WORDS: Record<AuditAction, string> = {
  'user.sign-up': 'signed up',
  'study.create': 'study created',
  'study.update': 'study changed',
  'study.delete': 'study deleted',
  'study.clone': 'study copied',
  'study.template': 'template mark changed',
  'invite.create': 'invitation sent',
  'invite.revoke': 'invitation withdrawn',
  'invite.accept': 'invitation accepted',
  'member.role': 'role changed',
  'member.remove': 'member removed',
  'revision.create': 'revision saved',
  'revision.restore': 'revision restored',
  'review.request': 'review requested',
  'review.approve': 'approved',
  'review.request-changes': 'changes requested',
  'review.reset': 'back to draft',
  'comment.create': 'comment written',
  'comment.edit': 'comment edited',
  'comment.delete': 'comment deleted',
  'comment.resolve': 'thread resolved',
  'comment.reopen': 'thread reopened',
  'attachment.upload': 'file attached',
  'attachment.delete': 'file removed',
  'study.import': 'study imported',
  'study.export': 'study exported',
};

/** Action families in words, for the filter ("review." = every review action). */
export const AUDIT_FAMILY_WORDS: Record<string, string> = {
  'user.': 'sign-ups',
  'study.': 'studies',
  'invite.': 'invitations',
  'member.': 'members',
  'revision.': 'revisions',
  'review.': 'reviews',
  'comment.': 'comments',
  'attachment.': 'attachments',
};

export const auditEventSchema = z.object({
  id: z.string(),
  at: isoDateSchema,
  actor: userRefSchema,
  action: z.string(),
  /** The action in words ("review requested"). */
  actionLabel: z.string(),
  studyId: z.string().nullable(),
  /** The study's name, also for a deleted study (then `deleted` is true). */
  study: z.object({ id: z.string(), name: z.string(), deleted: z.boolean() }).nullable(),
  /** The detail as people read it: member and study names, revision numbers, never ids or JSON. */
  text: z.string(),
  /** The recorded detail as stored (for API clients; pages show `text`). */
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
