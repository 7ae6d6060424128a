/** Outgoing mail as the owner sees it (`/api/mail`): the copies the server keeps in its database. */
import { z } from 'zod';
import { isoDateSchema } from './common.ts';

export const mailSummarySchema = z.object({
  id: z.string(),
  to: z.string(),
  subject: z.string(),
  sentAt: isoDateSchema,
  /** An SMTP server has accepted it; false while the server is still trying to send it. */
  delivered: z.boolean(),
});
export type MailSummary = z.infer<typeof mailSummarySchema>;

/** GET /api/mail: newest first. */
export const mailListResponseSchema = z.object({ items: z.array(mailSummarySchema) });
export type MailListResponse = z.infer<typeof mailListResponseSchema>;

/** GET /api/mail/:id. */
export const mailMessageSchema = mailSummarySchema.extend({
  from: z.string(),
  text: z.string(),
  html: z.string().optional(),
});
export type MailMessage = z.infer<typeof mailMessageSchema>;
