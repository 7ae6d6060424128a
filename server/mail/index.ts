/**
 * Outgoing mail through nodemailer. Every message is rendered to RFC 822 and kept under
 * `<dir>/<id>.eml` with `<id>.json` metadata, so owners can read it in the app without a mail
 * server. When SMTP_URL is set the message is also delivered over SMTP.
 */
import { randomBytes } from 'node:crypto';
import { mkdir, readFile, readdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import nodemailer from 'nodemailer';
import type { MailMessage, MailSummary } from '../../shared/api/mail.ts';

export interface OutgoingMail {
  /** The team the message belongs to: only that team's owners can read it in the app. */
  teamId: string;
  to: string;
  subject: string;
  text: string;
  html?: string;
}

interface StoredMail extends MailMessage {
  teamId: string;
}

export interface Mailer {
  /** Renders, stores and (with SMTP) delivers a message; returns its id. */
  send(mail: OutgoingMail): Promise<string>;
  /** The team's messages, newest first. */
  list(teamId: string): Promise<MailSummary[]>;
  /** One message of the team, or null. */
  get(teamId: string, id: string): Promise<MailMessage | null>;
}

const ID_RE = /^\d{13}-[0-9a-f]{8}$/;

/** Creates the mailer writing under `dir` (DATA_DIR/mail in the server). */
export function createMailer({ dir, from, smtpUrl }: { dir: string; from: string; smtpUrl?: string }): Mailer {
  const render = nodemailer.createTransport({ streamTransport: true, buffer: true, newline: 'unix' });
  const smtp = smtpUrl ? nodemailer.createTransport(smtpUrl) : null;

  async function readStored(id: string): Promise<StoredMail | null> {
    if (!ID_RE.test(id)) return null;
    try {
      return JSON.parse(await readFile(path.join(dir, `${id}.json`), 'utf8')) as StoredMail;
    } catch {
      return null;
    }
  }

  return {
    async send(mail) {
      await mkdir(dir, { recursive: true });
      // The id sorts by time: 13-digit epoch milliseconds, then random hex against collisions.
      const id = `${String(Date.now()).padStart(13, '0')}-${randomBytes(4).toString('hex')}`;
      const message = { from, to: mail.to, subject: mail.subject, text: mail.text, html: mail.html };
      const info = await render.sendMail(message);
      await writeFile(path.join(dir, `${id}.eml`), info.message as Buffer);
      const stored: StoredMail = {
        id,
        teamId: mail.teamId,
        to: mail.to,
        from,
        subject: mail.subject,
        sentAt: new Date().toISOString(),
        text: mail.text,
        ...(mail.html ? { html: mail.html } : {}),
      };
      await writeFile(path.join(dir, `${id}.json`), JSON.stringify(stored, null, 2));
      if (smtp) {
        try {
          await smtp.sendMail(message);
        } catch (err) {
          // The copy under DATA_DIR stays readable in the app; the owner can pass the link on by hand.
          console.error(`SMTP delivery of mail ${id} to ${mail.to} failed:`, err);
        }
      }
      return id;
    },

    async list(teamId) {
      let names: string[];
      try {
        names = await readdir(dir);
      } catch {
        return [];
      }
      const ids = names.filter((n) => n.endsWith('.json')).map((n) => n.slice(0, -5));
      const all = await Promise.all(ids.map(readStored));
      return all
        .filter((m): m is StoredMail => m !== null && m.teamId === teamId)
        .sort((a, b) => (a.id < b.id ? 1 : a.id > b.id ? -1 : 0))
        .map(({ id, to, subject, sentAt }) => ({ id, to, subject, sentAt }));
    },

    async get(teamId, id) {
      const m = await readStored(id);
      if (!m || m.teamId !== teamId) return null;
      const { teamId: _team, ...message } = m;
      return message;
    },
  };
}
