/** Review states (`/api/studies/:id/review`): request → approve | request changes; edits return the study to draft. */
import { z } from 'zod';
import { isoDateSchema, revisionRiskSchema, userRefSchema } from './common.ts';
import { positiveInt32 } from './limits.ts';
import { studyStatusSchema } from './studies.ts';

export const REVIEW_ACTIONS = ['request', 'approve', 'request-changes'] as const;
/** Most reviewers one request may name. */
export const MAX_REVIEWERS = 10;

/** POST /api/studies/:id/review. */
export const reviewActionRequestSchema = z
  .object({
    action: z.enum(REVIEW_ACTIONS),
    reviewers: z.array(z.string().min(1).max(100)).max(MAX_REVIEWERS, `At most ${MAX_REVIEWERS} reviewers`).optional(),
    message: z.string().trim().max(5000, 'Message is at most 5000 characters').optional(),
    /** The revision the caller looked at; approval is refused when the study has moved on. */
    revision: positiveInt32('revision').optional(),
    /**
     * Approving a revision with violations: the approver has read them (count and worst one) and
     * approves anyway. Without it such an approval is refused (400); the count is recorded.
     */
    acknowledgeViolations: z.boolean().optional(),
  })
  .superRefine((v, ctx) => {
    if (v.action === 'request' && (!v.reviewers || v.reviewers.length === 0)) {
      ctx.addIssue({ code: 'custom', path: ['reviewers'], message: 'Choose at least one reviewer' });
    }
    if (v.action === 'request-changes' && !v.message) {
      ctx.addIssue({ code: 'custom', path: ['message'], message: 'Say what should change' });
    }
  });
export type ReviewActionRequest = z.infer<typeof reviewActionRequestSchema>;

export const reviewEventSchema = z.object({
  id: z.string(),
  at: isoDateSchema,
  actor: userRefSchema,
  action: z.enum(['request', 'approve', 'request-changes', 'reset']),
  fromStatus: studyStatusSchema,
  toStatus: studyStatusSchema,
  revision: z.number().int().nullable(),
  reviewers: z.array(userRefSchema),
  message: z.string(),
  /** On an approval: the violations the approver acknowledged (null when there were none). */
  acknowledgedViolations: z.number().int().nullable(),
});
export type ReviewEvent = z.infer<typeof reviewEventSchema>;

/** GET /api/studies/:id/review and the answer to POST. Events oldest first. */
export const reviewStateSchema = z.object({
  status: studyStatusSchema,
  review: z.object({ requestedBy: userRefSchema, reviewers: z.array(userRefSchema), revision: z.number().int() }).nullable(),
  approvedRevision: z.number().int().nullable(),
  events: z.array(reviewEventSchema),
  /** The danger of the revision under review (else the approved one, else the latest): what a sign-off must state. */
  risk: revisionRiskSchema.nullable(),
});
export type ReviewState = z.infer<typeof reviewStateSchema>;
