/**
 * The mail folder (DATA_DIR/mail): each message as `<id>.eml` (RFC 822 as received or sent) and
 * `<id>.json` (what the outgoing-mail page shows). Ids sort by time.
 */
import { randomBytes } from 'node:crypto';
import { mkdir, readFile, readdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import type { MailMessage, MailSummary } from '../../shared/api/mail.ts';

/** A stored message: the API's message plus the team whose owners may read it. */
export interface StoredMail extends MailMessage {
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

/** Writes one message into `dir`. */
export async function storeMail(dir: string, raw: Buffer, m: StoredMail): Promise<void> {
  await mkdir(dir, { recursive: true });
  await writeFile(path.join(dir, `${m.id}.eml`), raw);
  await writeFile(path.join(dir, `${m.id}.json`), JSON.stringify(m, null, 2));
}

async function readStored(dir: string, id: string): Promise<StoredMail | null> {
  if (!MAIL_ID_RE.test(id)) return null;
  try {
    return JSON.parse(await readFile(path.join(dir, `${id}.json`), 'utf8')) as StoredMail;
  } catch {
    return null;
  }
}

/** The team's messages in `dir`, newest first. */
export async function listMail(dir: string, teamId: string): Promise<MailSummary[]> {
  let names: string[];
  try {
    names = await readdir(dir);
  } catch {
    return [];
  }
  const ids = names.filter((n) => n.endsWith('.json')).map((n) => n.slice(0, -5));
  const all = await Promise.all(ids.map((id) => readStored(dir, id)));
  return all
    .filter((m): m is StoredMail => m !== null && m.teamId === teamId)
    .sort((a, b) => (a.id < b.id ? 1 : a.id > b.id ? -1 : 0))
    .map(({ id, to, subject, sentAt }) => ({ id, to, subject, sentAt }));
}

/** One message of the team in `dir`, or null. */
export async function getMail(dir: string, teamId: string, id: string): Promise<MailMessage | null> {
  const m = await readStored(dir, id);
  if (!m || m.teamId !== teamId) return null;
  const { teamId: _team, ...message } = m;
  return message;
}
