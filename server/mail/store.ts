/**
 * The kept copies of outgoing mail, in the `mail_messages` table (shared by every app instance):
 * what the outgoing-mail page shows and the RFC 822 text sent over SMTP. Ids sort by time.
 * Earlier versions kept them as files under DATA_DIR/mail; `moveLocalMail` brings those in.
 */
import { randomBytes } from 'node:crypto';
import { readFile, readdir, rm, rmdir } from 'node:fs/promises';
import path from 'node:path';
import { and, desc, eq, sql } from 'drizzle-orm';
import type { MailMessage, MailSummary } from '../../shared/api/mail.ts';
import type { Db } from '../db/index.ts';
import { mailMessages } from '../db/schema.ts';

/** A stored message: the API's message plus the team whose owners may read it. */
export interface StoredMail extends Omit<MailMessage, 'delivered'> {
  teamId: string;
}

/** Header naming the team a message belongs to (set by the mailer, read by the local SMTP server). */
export const TEAM_HEADER = 'X-Wyeward-Team';
/** Header carrying the message id chosen by the mailer, so the sender knows where the copy lands. */
export const ID_HEADER = 'X-Wyeward-Mail-Id';

export const MAIL_ID_RE = /^\d{13}-[0-9a-f]{8}$/;

/** A new id: 13-digit epoch milliseconds, then random hex against collisions. */
export function newMailId(): string {
  return `${String(Date.now()).padStart(13, '0')}-${randomBytes(4).toString('hex')}`;
}

function values(raw: Buffer, m: StoredMail) {
  return {
    id: m.id,
    teamId: m.teamId,
    toAddress: m.to,
    fromAddress: m.from,
    subject: m.subject,
    bodyText: m.text,
    bodyHtml: m.html ?? null,
    raw: raw.toString('utf8'),
    createdAt: new Date(m.sentAt),
  };
}

/** Keeps a copy of a message about to be sent (not yet delivered). */
export async function storeMail(db: Pick<Db, 'insert'>, raw: Buffer, m: StoredMail): Promise<void> {
  await db.insert(mailMessages).values(values(raw, m));
}

/** Records a message an SMTP server accepted: marks the kept copy delivered, or keeps this one if there is none (mail sent by another client). */
export async function storeDelivered(db: Db, raw: Buffer, m: StoredMail): Promise<void> {
  await db
    .insert(mailMessages)
    .values({ ...values(raw, m), deliveredAt: new Date() })
    .onConflictDoUpdate({ target: mailMessages.id, set: { deliveredAt: sql`coalesce(${mailMessages.deliveredAt}, now())` } });
}

/** Marks a kept copy delivered. */
export async function markDelivered(db: Db, id: string): Promise<void> {
  await db.update(mailMessages).set({ deliveredAt: sql`coalesce(${mailMessages.deliveredAt}, now())` }).where(eq(mailMessages.id, id));
}

/** The kept copy with its RFC 822 text, or null. */
export async function rawMail(db: Db, id: string) {
  const [row] = await db.select().from(mailMessages).where(eq(mailMessages.id, id)).limit(1);
  return row ?? null;
}

/** The team's messages, newest first (the newest 500). */
export async function listMail(db: Db, teamId: string): Promise<MailSummary[]> {
  const rows = await db
    .select({ id: mailMessages.id, to: mailMessages.toAddress, subject: mailMessages.subject, sentAt: mailMessages.createdAt, deliveredAt: mailMessages.deliveredAt })
    .from(mailMessages)
    .where(eq(mailMessages.teamId, teamId))
    .orderBy(desc(mailMessages.id))
    .limit(500);
  return rows.map(({ deliveredAt, ...r }) => ({ ...r, sentAt: r.sentAt.toISOString(), delivered: deliveredAt !== null }));
}

/** One message of the team, or null. */
export async function getMail(db: Db, teamId: string, id: string): Promise<MailMessage | null> {
  if (!MAIL_ID_RE.test(id)) return null;
  const [r] = await db
    .select()
    .from(mailMessages)
    .where(and(eq(mailMessages.id, id), eq(mailMessages.teamId, teamId)))
    .limit(1);
  if (!r) return null;
  return { id: r.id, to: r.toAddress, from: r.fromAddress, subject: r.subject, sentAt: r.createdAt.toISOString(), delivered: r.deliveredAt !== null, text: r.bodyText, ...(r.bodyHtml !== null ? { html: r.bodyHtml } : {}) };
}

/**
 * Moves the mail folder of earlier versions (`<id>.json` + `<id>.eml` under DATA_DIR/mail) into
 * the table, as delivered, then removes the files (and the folder once empty). Returns how many moved.
 */
export async function moveLocalMail(db: Db, dir: string): Promise<number> {
  let names: string[];
  try {
    names = await readdir(dir);
  } catch {
    return 0;
  }
  let moved = 0;
  for (const id of names.filter((n) => n.endsWith('.json')).map((n) => n.slice(0, -5)).filter((id) => MAIL_ID_RE.test(id))) {
    const json = path.join(dir, `${id}.json`);
    const eml = path.join(dir, `${id}.eml`);
    const m = JSON.parse(await readFile(json, 'utf8')) as StoredMail;
    const raw = await readFile(eml).catch(() => Buffer.from(''));
    await db
      .insert(mailMessages)
      .values({ ...values(raw, { ...m, id }), deliveredAt: new Date(m.sentAt) })
      .onConflictDoNothing();
    await rm(json, { force: true });
    await rm(eml, { force: true });
    moved++;
  }
  await rmdir(dir).catch(() => {});
  return moved;
}
