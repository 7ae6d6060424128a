/** In-app notifications (`/api/notifications`). */
import { z } from 'zod';
import { isoDateSchema, userRefSchema } from './common.ts';

export const NOTIFICATION_KINDS = ['review-requested', 'mention', 'changes-requested', 'approved'] as const;

export const notificationSchema = z.object({
  id: z.string(),
  kind: z.enum(NOTIFICATION_KINDS),
  study: z.object({ id: z.string(), name: z.string() }).nullable(),
  actor: userRefSchema,
  text: z.string(),
  createdAt: isoDateSchema,
  read: z.boolean(),
});
export type Notification = z.infer<typeof notificationSchema>;

/** GET /api/notifications: newest 100 and the unread count. */
export const notificationListResponseSchema = z.object({ items: z.array(notificationSchema), unread: z.number().int() });
export type NotificationListResponse = z.infer<typeof notificationListResponseSchema>;

/** POST /api/notifications/read: no ids = mark all read. */
export const markReadRequestSchema = z.object({ ids: z.array(z.string().max(100)).max(500).optional() });
export type MarkReadRequest = z.infer<typeof markReadRequestSchema>;

export const markReadResponseSchema = z.object({ unread: z.number().int() });
