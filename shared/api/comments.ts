/** Comments on a study (`/api/studies/:id/comments`): plain-text threads, anchored to an element or a result row. */
import { z } from 'zod';
import { isoDateSchema, userRefSchema } from './common.ts';

export const COMMENT_MAX = 5000;

export const commentAnchorSchema = z.union([
  z.strictObject({ elementId: z.string().min(1).max(200) }),
  z.strictObject({ resultRow: z.strictObject({ table: z.string().min(1).max(100), key: z.string().min(1).max(300) }) }),
]);
export type CommentAnchor = z.infer<typeof commentAnchorSchema>;

const bodySchema = z.string().trim().min(1, 'Write something first').max(COMMENT_MAX, `A comment is at most ${COMMENT_MAX} characters`);

export const commentSchema = z.object({
  id: z.string(),
  parentId: z.string().nullable(),
  author: userRefSchema,
  /** Plain text, exactly as written; never HTML. */
  body: z.string(),
  anchor: commentAnchorSchema.nullable(),
  /** The study's latest revision when the comment was written. */
  revision: z.number().int().nullable(),
  mentions: z.array(userRefSchema),
  resolved: z.boolean(),
  resolvedBy: userRefSchema.nullable(),
  resolvedAt: isoDateSchema.nullable(),
  createdAt: isoDateSchema,
  editedAt: isoDateSchema.nullable(),
  deleted: z.boolean(),
});
export type Comment = z.infer<typeof commentSchema>;

export const commentListResponseSchema = z.object({ items: z.array(commentSchema) });
export type CommentListResponse = z.infer<typeof commentListResponseSchema>;

/** POST /api/studies/:id/comments. */
export const createCommentRequestSchema = z.object({
  body: bodySchema,
  parentId: z.string().max(100).optional(),
  anchor: commentAnchorSchema.optional(),
});
export type CreateCommentRequest = z.infer<typeof createCommentRequestSchema>;

/** PATCH /api/studies/:id/comments/:commentId. */
export const updateCommentRequestSchema = z
  .object({ body: bodySchema.optional(), resolved: z.boolean().optional() })
  .refine((v) => v.body !== undefined || v.resolved !== undefined, { message: 'Nothing to change', path: ['body'] });
export type UpdateCommentRequest = z.infer<typeof updateCommentRequestSchema>;
