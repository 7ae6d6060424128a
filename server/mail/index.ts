/**
 * Outgoing mail through nodemailer over SMTP. Without SMTP_URL the mailer starts the local fake
 * SMTP server (sink.ts) on first use and sends to it; the sink stores what it receives under
 * DATA_DIR/mail, where owners read it in the app. With SMTP_URL mail goes to that server and a
 * sent copy is stored in the same folder. If sending fails, the copy is stored anyway and the
 * failure logged, so an invite link is never lost.
 */
import { logEvent } from '../log.ts';
import nodemailer, { type SendMailOptions, type Transporter } from 'nodemailer';
import type { MailMessage, MailSummary } from '../../shared/api/mail.ts';
import { startMailSink, type MailSink } from './sink.ts';
import { getMail, ID_HEADER, listMail, newMailId, storeMail, TEAM_HEADER } from './store.ts';

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
  /** Sends a message (and makes sure a copy is stored); returns its id. */
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
  /** The mail folder (DATA_DIR/mail). */
  dir: string;
  from: string;
  /** A real SMTP server (SMTP_URL); without it the local sink is used. */
  smtpUrl?: string;
  /** Port of the local sink (SMTP_SINK_PORT; 0 = a free port). */
  sinkPort?: number;
}

/** Creates the mailer writing under `dir`. */
export function createMailer({ dir, from, smtpUrl, sinkPort = 0 }: MailerOptions): Mailer {
  const render = nodemailer.createTransport({ streamTransport: true, buffer: true, newline: 'unix' });
  let sink: Promise<MailSink> | null = null;
  let transport: Promise<Transporter> | null = null;

  function getTransport(): Promise<Transporter> {
    transport ??= (async () => {
      if (smtpUrl) return nodemailer.createTransport(smtpUrl);
      sink ??= startMailSink({ dir, port: sinkPort });
      const s = await sink;
      return nodemailer.createTransport({ host: s.host, port: s.port, secure: false, ignoreTLS: true });
    })();
    return transport;
  }

  async function storeCopy(id: string, mail: OutgoingMail, message: SendMailOptions) {
    const info = await render.sendMail(message);
    await storeMail(dir, info.message as Buffer, {
      id,
      teamId: mail.teamId,
      to: mail.to,
      from,
      subject: mail.subject,
      sentAt: new Date().toISOString(),
      text: mail.text,
      ...(mail.html ? { html: mail.html } : {}),
    });
  }

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
      try {
        await (await getTransport()).sendMail(message);
        // The sink stored the message before acknowledging it; a real server keeps nothing for us.
        if (smtpUrl) await storeCopy(id, mail, message);
      } catch (err) {
        logEvent('warn', { event: 'smtp-delivery-failed', mailId: id, error: err instanceof Error ? err.name : typeof err, note: 'a copy is kept under DATA_DIR/mail' });
        await storeCopy(id, mail, message);
      }
      return id;
    },
    list: (teamId) => listMail(dir, teamId),
    get: (teamId, id) => getMail(dir, teamId, id),
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
