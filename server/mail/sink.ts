/**
 * The local fake SMTP server (smtp-server, bound to 127.0.0.1): in demo mode and in tests the app
 * sends its mail over real SMTP to this server, which records every message it receives in the
 * database (marking the app's kept copy delivered, or keeping a message from any other client) for
 * the outgoing-mail page. It accepts any sender and recipient and never
 * relays anything onward. Production sets SMTP_URL instead.
 */
import type { AddressInfo } from 'node:net';
import { simpleParser, type AddressObject, type ParsedMail } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { Db } from '../db/index.ts';
import { ID_HEADER, MAIL_ID_RE, newMailId, storeDelivered, TEAM_HEADER } from './store.ts';

export interface MailSink {
  host: string;
  port: number;
  close(): Promise<void>;
}

/** Largest message the sink accepts (bytes); the app's messages are a few kB. */
const MAX_MESSAGE = 5 * 1024 * 1024;

/** CRLF → LF, byte by byte (the message may hold 8-bit text in any charset). */
function unixNewlines(b: Buffer): Buffer {
  const out = Buffer.allocUnsafe(b.length);
  let n = 0;
  for (let i = 0; i < b.length; i++) {
    if (b[i] === 0x0d && b[i + 1] === 0x0a) continue;
    out[n++] = b[i];
  }
  return out.subarray(0, n);
}

/** A header as it was written (`Wyeward <no-reply@…>`), unfolded; the parsed address list as a fallback. */
function headerText(parsed: ParsedMail, key: string, fallback: AddressObject | AddressObject[] | undefined): string {
  const line = parsed.headerLines.find((h) => h.key === key)?.line;
  if (line) return line.slice(line.indexOf(':') + 1).replace(/\r?\n[ \t]+/g, ' ').trim();
  return fallback ? (Array.isArray(fallback) ? fallback : [fallback]).map((x) => x.text).join(', ') : '';
}

/** Starts the sink on `port` (0 = a free port) and resolves once it listens. */
export async function startMailSink({ db, port = 0 }: { db: Db; port?: number }): Promise<MailSink> {
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
        // SMTP carries CRLF; kept copies have Unix line endings (as the mailer renders them).
        const raw = unixNewlines(Buffer.concat(chunks));
        void (async () => {
          const parsed = await simpleParser(raw);
          const headerId = String(parsed.headers.get(ID_HEADER.toLowerCase()) ?? '');
          const id = MAIL_ID_RE.test(headerId) ? headerId : newMailId();
          await storeDelivered(db, raw, {
            id,
            teamId: String(parsed.headers.get(TEAM_HEADER.toLowerCase()) ?? ''),
            to: headerText(parsed, 'to', parsed.to),
            from: headerText(parsed, 'from', parsed.from),
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
