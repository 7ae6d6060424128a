/** What `npm start` (index.ts) and `npm run dev` (dev.ts) share: open the database, seed, build the app, listen, shut down cleanly. */
import { execFile } from 'node:child_process';
import { existsSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import path from 'node:path';
import { promisify } from 'node:util';
import { lt } from 'drizzle-orm';
import type { Express } from 'express';
import { createApp } from './app.ts';
import type { Config } from './config.ts';
import { DEMO_ACCOUNTS } from './db/demo-accounts.ts';
import { closeDb, dbKind, describeConnection, openDb } from './db/index.ts';
import { sessions } from './db/schema.ts';
import { seedDemo, type SeedResult } from './db/seed.ts';
import { createJobRunner } from './jobs/index.ts';
import { createMailer } from './mail/index.ts';
import { moveLocalMail } from './mail/store.ts';
import { createSweepRunner } from './services/sweep-run.ts';
import { clearExpiredThrottles } from './auth/rate-limit.ts';
import { closeWork, configureWork } from './work/index.ts';
import { drainServer, keepIdleConnections, trackRequests } from './shutdown.ts';
import { moveLocalAttachments } from './storage/move-attachments.ts';
import { objectStoreFor } from './storage/objects.ts';

const execFileAsync = promisify(execFile);

/** The project root (the directory holding package.json). */
export const ROOT = path.resolve(import.meta.dirname, '..');

/** Where the configured database is, for messages: the server (without credentials) or the embedded directory. */
export function databaseLabel(config: Config): string {
  return config.databaseUrl ? `PostgreSQL at ${describeConnection(config.databaseUrl)}` : `embedded database in ${path.join(config.dataDir, 'pglite')}`;
}

/** Opens the configured database (DATABASE_URL, else PGlite under DATA_DIR) without migrating or seeding it (the export/import tools). */
export function openConfiguredDb(config: Config, { migrate = true }: { migrate?: boolean } = {}) {
  return openDb(
    config.databaseUrl ? { url: config.databaseUrl, poolMax: config.databasePoolMax, migrate } : { dataDir: path.join(config.dataDir, 'pglite'), migrate },
  );
}

/**
 * A new embedded database in `dir` (initdb, migrations, and the demo seed when asked), made by a
 * child process that exits when done (db/create-embedded.ts: the memory this takes is then given
 * back); answers the seed's result.
 */
async function createEmbeddedDatabase(dir: string, demo: boolean): Promise<{ seeded: SeedResult | null }> {
  const { stdout } = await execFileAsync(process.execPath, ['--import', 'tsx', path.join(ROOT, 'server', 'db', 'create-embedded.ts'), dir, demo ? '1' : '0'], {
    cwd: ROOT,
    maxBuffer: 1024 * 1024,
  }).catch((err: { stderr?: string; message: string }) => {
    throw new Error(`Creating the embedded database in ${dir} failed: ${err.stderr?.trim() || err.message}`);
  });
  return JSON.parse(stdout.trim().split('\n').at(-1) ?? '{}') as { seeded: SeedResult | null };
}

/** Opens (and migrates) the configured database and, in demo mode, seeds the demo team into an empty one. */
export async function prepareDatabase(config: Config, log: (msg: string) => void = console.log) {
  const dir = path.join(config.dataDir, 'pglite');
  if (!config.databaseUrl && !existsSync(path.join(dir, 'PG_VERSION'))) {
    // Creating and seeding an embedded database leaves the process that did it holding several hundred MB
    // more than one that opens it afterwards: a short-lived child process does it.
    const { seeded } = await createEmbeddedDatabase(dir, config.demo);
    if (seeded?.created) log(`Demo data seeded: ${seeded.users} accounts, ${seeded.studies} studies.`);
  }
  const db = await openConfiguredDb(config);
  // lucia drops an expired session when it is presented; this clears the ones never presented again.
  await db.delete(sessions).where(lt(sessions.expiresAt, new Date()));
  await clearExpiredThrottles(db);
  if (config.demo) {
    const seeded = await seedDemo(db);
    if (seeded.created) log(`Demo data seeded: ${seeded.users} accounts, ${seeded.studies} studies.`);
  }
  return db;
}

export interface RunOptions {
  /** Extra clean-up on shutdown, before the database closes. */
  onClose?: () => Promise<void>;
  /** The HTTP server to serve on (dev mode shares it with vite's hot-reload socket); a new one by default. */
  server?: Server;
  /** Development mode (vite middleware): a CSP that allows hot reload. */
  dev?: boolean;
}

/** Opens the database, seeds the demo team when asked, and serves the app with the given client. */
export async function run(config: Config, mountClient: (app: Express) => void, { onClose = async () => {}, server = createServer(), dev = false }: RunOptions = {}) {
  const started = Date.now();
  configureWork({ threads: config.workThreads, timeoutMs: config.workTimeoutMs });
  const db = await prepareDatabase(config);
  const jobs = createJobRunner(db, { pollMs: config.jobsPollMs });
  const mailer = createMailer({ db, jobs, from: config.mailFrom, smtpUrl: config.smtpUrl, sinkPort: config.smtpSinkPort });
  const mail = await mailer.start();
  const movedMail = await moveLocalMail(db, path.join(config.dataDir, 'mail'));
  if (movedMail > 0) console.log(`Moved ${movedMail} kept messages from ${path.join(config.dataDir, 'mail')} into the database.`);
  jobs.start();
  // Sweeps have a runner of their own: a long sweep never holds up mail delivery.
  const sweeps = createSweepRunner(db, { pollMs: config.jobsPollMs });
  sweeps.start();
  const objects = objectStoreFor(config);
  const bucket = await objects.start();
  if (config.databaseUrl && bucket.local) {
    console.warn('DATABASE_URL is set but no bucket (S3_URL / S3_BUCKET): attached files stay on this machine under DATA_DIR/objects, and other instances will not see them.');
  }
  const movedFiles = await moveLocalAttachments(db, objects, config.dataDir);
  if (movedFiles.moved + movedFiles.dropped > 0) console.log(`Moved ${movedFiles.moved} attachment files from ${path.join(config.dataDir, 'attachments')} into the bucket (${movedFiles.dropped} files of deleted attachments removed).`);
  const app = createApp({ db, config, mailer, objects, sweeps, mountClient, dev });

  trackRequests(server);
  keepIdleConnections(server);
  server.on('request', app);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(config.port, () => {
      server.off('error', reject);
      resolve();
    });
  });
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : config.port;
  console.log(`Wyeward is running at http://localhost:${port} (data in ${config.dataDir}; ${dbKind(db) === 'postgres' ? databaseLabel(config) : 'embedded database'}; started in ${((Date.now() - started) / 1000).toFixed(1)} s)`);
  console.log(
    mail.local
      ? `Mail goes to the local fake SMTP server at ${mail.smtp}; owners read it on the Outgoing mail page (set SMTP_URL for real delivery).`
      : `Mail goes to ${mail.smtp}; a copy is kept in the database for the Outgoing mail page.`,
  );
  console.log(
    bucket.local
      ? `Files go to the local fake S3 server at ${bucket.endpoint}, stored in ${path.join(config.dataDir, 'objects')} (set S3_URL / S3_BUCKET for a shared bucket).`
      : `Files go to the bucket "${bucket.bucket}" at ${bucket.endpoint}.`,
  );
  if (config.demo) {
    console.log('Demo mode is on (DEMO=0 turns it off). Demo accounts:');
    for (const a of DEMO_ACCOUNTS) console.log(`  ${a.role.padEnd(9)} ${a.email}  password: ${a.password}`);
  }
  console.log(
    'Caution: Wyeward is an engineering aid; results are only as good as the model. Designs must follow local codes and be checked under licensed practice. Lost-neutral conditions put dangerous voltages on equipment.',
  );

  let closing = false;
  const shutdown = async (signal: string) => {
    if (closing) return;
    closing = true;
    console.log(`${signal} received: finishing requests in flight, then closing…`);
    try {
      const cut = await drainServer(server, config.shutdownTimeoutMs);
      if (cut > 0) console.log(`${cut} request(s) still running after ${config.shutdownTimeoutMs} ms were cut.`);
      await onClose();
      await sweeps.close(); // a sweep in progress goes back to the queue between two batches
      await jobs.close();
      await closeWork();
      await mailer.close();
      await objects.close();
      await closeDb(db);
      process.exit(0);
    } catch (err) {
      console.error('Error while closing:', err);
      process.exit(1);
    }
  };
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
  process.on('SIGINT', () => void shutdown('SIGINT'));
  return { server, db };
}
