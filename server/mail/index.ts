/**
 * Outgoing mail through nodemailer over SMTP, sent by a background job. `send` keeps the message
 * in the database (the outgoing-mail page reads it there at once) and queues a `mail.deliver`
 * job; whichever app instance claims the job sends it, once, over SMTP: to SMTP_URL, or without it
 * to the local fake SMTP server (sink.ts), which this mailer starts on first use. A failed attempt
 * is logged and retried with back-off (server/jobs), so an invite link is never lost and the
 * action that caused the mail never fails because of it.
 */
import nodemailer, { type SendMailOptions, type Transporter } from 'nodemailer';
import type { MailMessage, MailSummary } from '../../shared/api/mail.ts';
import type { Db } from '../db/index.ts';
import type { JobRunner } from '../jobs/index.ts';
import { startMailSink, type MailSink } from './sink.ts';
import { getMail, ID_HEADER, listMail, markDelivered, newMailId, rawMail, storeMail, TEAM_HEADER } from './store.ts';

export interface OutgoingMail {
  /** The team the message belongs to: only that team's owners can read it in the app. */
  teamId: string;
  to: string;
  subject: string;
  text: string;
  /** An HTML alternative; every user-written part must already be escaped (templates.ts). */
  html?: string;
}

export interface Mailer {
  /** Keeps the message and queues its delivery; returns its id. */
  send(mail: OutgoingMail): Promise<string>;
  /** The team's messages, newest first. */
  list(teamId: string): Promise<MailSummary[]>;
  /** One message of the team, or null. */
  get(teamId: string, id: string): Promise<MailMessage | null>;
  /** Starts the local SMTP server now (when no SMTP_URL) and says where mail goes. */
  start(): Promise<{ smtp: string; local: boolean }>;
  /** Stops the local SMTP server, if started. */
  close(): Promise<void>;
}

export interface MailerOptions {
  db: Db;
  /** The background jobs that deliver mail (the mailer registers `mail.deliver` on it). */
  jobs: JobRunner;
  from: string;
  /** A real SMTP server (SMTP_URL); without it the local sink is used. */
  smtpUrl?: string;
  /** Port of the local sink (SMTP_SINK_PORT; 0 = a free port). */
  sinkPort?: number;
}

/** The kind of the delivery job. */
export const DELIVER_JOB = 'mail.deliver';

/** Creates the mailer over `db`, delivering through `jobs`. */
export function createMailer({ db, jobs, from, smtpUrl, sinkPort = 0 }: MailerOptions): Mailer {
  const render = nodemailer.createTransport({ streamTransport: true, buffer: true, newline: 'unix' });
  let sink: Promise<MailSink> | null = null;
  let transport: Promise<Transporter> | null = null;

  function getTransport(): Promise<Transporter> {
    transport ??= (async () => {
      if (smtpUrl) return nodemailer.createTransport(smtpUrl);
      sink ??= startMailSink({ db, port: sinkPort });
      const s = await sink;
      return nodemailer.createTransport({ host: s.host, port: s.port, secure: false, ignoreTLS: true });
    })();
    return transport;
  }

  jobs.handle(DELIVER_JOB, async (payload) => {
    const { mailId } = payload as { mailId: string };
    const row = await rawMail(db, mailId);
    if (!row || row.deliveredAt) return; // already sent (the job ran before, its completion was lost)
    await (await getTransport()).sendMail({ envelope: { from: row.fromAddress, to: row.toAddress }, raw: row.raw });
    // The sink marks what it receives; a real server keeps nothing for us.
    await markDelivered(db, mailId);
  });

  return {
    async send(mail) {
      const id = newMailId();
      const message: SendMailOptions = {
        from,
        to: mail.to,
        subject: mail.subject,
        text: mail.text,
        ...(mail.html ? { html: mail.html } : {}),
        headers: { [TEAM_HEADER]: mail.teamId, [ID_HEADER]: id },
      };
      const info = await render.sendMail(message);
      await db.transaction(async (tx) => {
        await storeMail(tx, info.message as Buffer, {
          id,
          teamId: mail.teamId,
          to: mail.to,
          from,
          subject: mail.subject,
          sentAt: new Date().toISOString(),
          text: mail.text,
          ...(mail.html ? { html: mail.html } : {}),
        });
        await jobs.enqueueIn(tx, DELIVER_JOB, { mailId: id });
      });
      jobs.wake();
      return id;
    },
    list: (teamId) => listMail(db, teamId),
    get: (teamId, id) => getMail(db, teamId, id),
    async start() {
      if (smtpUrl) return { smtp: new URL(smtpUrl).host, local: false };
      await getTransport();
      const s = await sink!;
      return { smtp: `${s.host}:${s.port}`, local: true };
    },
    async close() {
      if (sink) await (await sink).close();
      sink = null;
      transport = null;
    },
  };
}
