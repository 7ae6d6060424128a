/** Files attached to a study (`/api/studies/:id/attachments`). */
import { z } from 'zod';
import { isoDateSchema, userRefSchema } from './common.ts';

/** Largest accepted file: 10 MB (10 × 1024 × 1024 bytes). */
export const ATTACHMENT_MAX_BYTES = 10 * 1024 * 1024;

/** Accepted types, by content: extension(s) that must go with each. */
export const ATTACHMENT_TYPES = {
  'application/pdf': ['pdf'],
  'image/png': ['png'],
  'image/jpeg': ['jpg', 'jpeg'],
  'text/csv': ['csv'],
} as const;
export type AttachmentContentType = keyof typeof ATTACHMENT_TYPES;

export const attachmentSchema = z.object({
  id: z.string(),
  fileName: z.string(),
  contentType: z.string(),
  size: z.number().int(),
  uploadedBy: userRefSchema,
  createdAt: isoDateSchema,
});
export type Attachment = z.infer<typeof attachmentSchema>;

export const attachmentListResponseSchema = z.object({ items: z.array(attachmentSchema) });
export type AttachmentListResponse = z.infer<typeof attachmentListResponseSchema>;
