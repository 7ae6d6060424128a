/**
 * The local fake SMTP server (smtp-server, bound to 127.0.0.1): in demo mode and in tests the app
 * sends its mail over real SMTP to this server, which stores every message it receives in the mail
 * folder (DATA_DIR/mail) for the outgoing-mail page. It accepts any sender and recipient and never
 * relays anything onward. Production sets SMTP_URL instead.
 */
import type { AddressInfo } from 'node:net';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { ID_HEADER, MAIL_ID_RE, newMailId, storeMail, TEAM_HEADER } from './store.ts';

export interface MailSink {
  host: string;
  port: number;
  close(): Promise<void>;
}

/** Largest message the sink accepts (bytes); the app's messages are a few kB. */
const MAX_MESSAGE = 5 * 1024 * 1024;

function addressText(a: AddressObject | AddressObject[] | undefined): string {
  if (!a) return '';
  return (Array.isArray(a) ? a : [a]).map((x) => x.text).join(', ');
}

/** Starts the sink on `port` (0 = a free port) and resolves once it listens. */
export async function startMailSink({ dir, port = 0 }: { dir: string; port?: number }): Promise<MailSink> {
  const host = '127.0.0.1';
  const server = new SMTPServer({
    secure: false,
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    size: MAX_MESSAGE,
    logger: false,
    banner: 'Wyeward local mail sink (stores, never relays)',
    onData(stream, _session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const raw = Buffer.concat(chunks);
        void (async () => {
          const parsed = await simpleParser(raw);
          const headerId = String(parsed.headers.get(ID_HEADER.toLowerCase()) ?? '');
          const id = MAIL_ID_RE.test(headerId) ? headerId : newMailId();
          await storeMail(dir, raw, {
            id,
            teamId: String(parsed.headers.get(TEAM_HEADER.toLowerCase()) ?? ''),
            to: addressText(parsed.to),
            from: addressText(parsed.from),
            subject: parsed.subject ?? '',
            sentAt: (parsed.date ?? new Date()).toISOString(),
            text: parsed.text ?? '',
            ...(typeof parsed.html === 'string' ? { html: parsed.html } : {}),
          });
        })().then(
          () => callback(),
          (err: Error) => callback(err),
        );
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.server.once('error', reject);
    server.listen(port, host, () => {
      server.server.off('error', reject);
      resolve();
    });
  });
  // The sink must never keep a finished process (a test file, a CLI) alive on its own.
  server.server.unref();
  const actual = (server.server.address() as AddressInfo).port;
  return { host, port: actual, close: () => new Promise<void>((resolve) => server.close(() => resolve())) };
}
