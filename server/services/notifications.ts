/** In-app notifications and their e-mails (review requested, mention, changes requested, approved). */
import { and, count, desc, eq, inArray, isNull } from 'drizzle-orm';
import type { MarkReadRequest, Notification, NotificationListResponse } from '../../shared/api/notifications.ts';
import type { Actor } from '../auth/index.ts';
import type { Db } from '../db/index.ts';
import { notifications, studies, users } from '../db/schema.ts';
import type { Mailer } from '../mail/index.ts';
import { notificationMail } from '../mail/templates.ts';
import { isUuid } from '../errors.ts';

export type NotificationKind = Notification['kind'];

export interface Recipient {
  id: string;
  name: string;
  email: string;
}

/** Link to a study in the app. */
export function studyLink(appUrl: string, studyId: string): string {
  return `${appUrl}/studies/${studyId}`;
}

/**
 * Notifies each recipient in the app and by e-mail. Mail failures never undo the action that
 * caused them (the mailer keeps a copy and logs).
 */
export async function notify(
  db: Db,
  mailer: Mailer,
  n: { kind: NotificationKind; teamId: string; studyId: string; actorId: string; recipients: Recipient[]; text: string; subject: string; quote?: string; link: string; details?: string[] },
): Promise<void> {
  const seen = new Set<string>();
  const to = n.recipients.filter((r) => r.id !== n.actorId && !seen.has(r.id) && seen.add(r.id));
  if (to.length === 0) return;
  await db.insert(notifications).values(to.map((r) => ({ userId: r.id, teamId: n.teamId, kind: n.kind, studyId: n.studyId, actorId: n.actorId, text: n.text })));
  const body = notificationMail({ headline: n.text, details: n.details, quote: n.quote, link: n.link });
  for (const r of to) {
    await mailer.send({ teamId: n.teamId, to: r.email, subject: n.subject, text: body.text, html: body.html });
  }
}

/** Recipients by user id (members of the team only). */
export async function recipients(db: Db, ids: string[]): Promise<Recipient[]> {
  if (ids.length === 0) return [];
  return db.select({ id: users.id, name: users.name, email: users.email }).from(users).where(inArray(users.id, ids));
}

/** The caller's newest 100 notifications and the unread count. */
export async function listNotifications(db: Db, actor: Actor): Promise<NotificationListResponse> {
  const mine = and(eq(notifications.userId, actor.userId), eq(notifications.teamId, actor.teamId));
  const rows = await db
    .select({ n: notifications, actorName: users.name, studyName: studies.name, studyDeleted: studies.deletedAt })
    .from(notifications)
    .innerJoin(users, eq(users.id, notifications.actorId))
    .leftJoin(studies, eq(studies.id, notifications.studyId))
    .where(mine)
    .orderBy(desc(notifications.createdAt), desc(notifications.id))
    .limit(100);
  const [{ unread }] = await db.select({ unread: count() }).from(notifications).where(and(mine, isNull(notifications.readAt)));
  return {
    items: rows.map(({ n, actorName, studyName, studyDeleted }) => ({
      id: n.id,
      kind: n.kind,
      study: n.studyId && studyName !== null && !studyDeleted ? { id: n.studyId, name: studyName } : null,
      actor: { id: n.actorId, name: actorName },
      text: n.text,
      createdAt: n.createdAt.toISOString(),
      read: n.readAt !== null,
    })),
    unread,
  };
}

/** Marks the given (or all) of the caller's notifications read; returns the unread count. */
export async function markRead(db: Db, actor: Actor, input: MarkReadRequest): Promise<{ unread: number }> {
  const mine = and(eq(notifications.userId, actor.userId), eq(notifications.teamId, actor.teamId), isNull(notifications.readAt));
  const ids = (input.ids ?? []).filter(isUuid);
  if (input.ids === undefined || ids.length > 0) {
    await db
      .update(notifications)
      .set({ readAt: new Date() })
      .where(and(mine, input.ids === undefined ? undefined : inArray(notifications.id, ids)));
  }
  const [{ unread }] = await db.select({ unread: count() }).from(notifications).where(mine);
  return { unread };
}
