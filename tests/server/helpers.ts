/** Shared set-up of the API tests: an app on a fresh database, accounts and signed-in agents. */
import { randomUUID } from 'node:crypto';
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { eq } from 'drizzle-orm';
import request from 'supertest';
import type { Role } from '../../shared/api/common.ts';
import { emptyStudyContent } from '../../shared/api/studies.ts';
import { createApp } from '../../server/app.ts';
import { hashPassword } from '../../server/auth/passwords.ts';
import { readConfig, type Config } from '../../server/config.ts';
import type { Db } from '../../server/db/index.ts';
import { memberships, studies, teams, users } from '../../server/db/schema.ts';
import { createJobRunner, type JobRunner } from '../../server/jobs/index.ts';
import { createMailer, type Mailer } from '../../server/mail/index.ts';
import { createSweepRunner } from '../../server/services/sweep-run.ts';
import { objectStoreFor, type ObjectStore } from '../../server/storage/objects.ts';

export const PASSWORD = 'correct horse battery';
export const APP_URL = 'http://localhost:3000';

export interface TestApp {
  app: ReturnType<typeof createApp>;
  db: Db;
  mailer: Mailer;
  /** The file bucket: the local fake S3 server under the test's DATA_DIR/objects, started on first use. */
  objects: ObjectStore;
  /** The background jobs of this app (mail delivery), running; `mailer.close()` stops them too. */
  jobs: JobRunner;
  /** This app's runner of sweep jobs (woken by the sweeps it queues; `mailer.close()` stops it too). */
  sweeps: JobRunner;
  config: Config;
}

/** An app on `db` with its own mail directory (and its own sign-in rate limiter). */
export function makeApp(db: Db, env: Record<string, string> = {}): TestApp {
  const dataDir = mkdtempSync(path.join(tmpdir(), 'wyeward-test-'));
  // Every test file's requests come from one address: sign-ups are not what most tests are about.
  const config = readConfig({ DATA_DIR: dataDir, APP_URL: APP_URL, DEMO: '0', SIGN_UP_ADDRESS_LIMIT: '100000', ...env });
  const jobs = createJobRunner(db);
  const sweeps = createSweepRunner(db);
  const mailer = createMailer({ db, jobs, from: config.mailFrom });
  const closeMailer = mailer.close;
  // Test files end with mailer.close() then the database's close: the job loops stop first.
  mailer.close = async () => {
    await sweeps.close();
    await jobs.close();
    await closeMailer();
  };
  // No polling: each app runs the jobs it queues at once (wake()); many test files close their database without closing the app.
  const objects = objectStoreFor(config);
  return { app: createApp({ db, config, mailer, objects, sweeps }), db, mailer, objects, jobs, sweeps, config };
}

let passwordHash: Promise<string> | null = null;

/** Inserts a team (argon2 hashing once per file keeps this fast). */
export async function makeTeam(db: Db, name = `Team ${randomUUID().slice(0, 8)}`): Promise<string> {
  const [t] = await db.insert(teams).values({ name }).returning({ id: teams.id });
  return t.id;
}

/** Inserts a user with `role` in `teamId`; the password is PASSWORD. */
export async function makeUser(db: Db, teamId: string, role: Role, name = `${role} ${randomUUID().slice(0, 6)}`) {
  passwordHash ??= hashPassword(PASSWORD);
  const id = randomUUID();
  const email = `${role}-${id.slice(0, 8)}@example.test`;
  await db.insert(users).values({ id, email, name, passwordHash: await passwordHash });
  await db.insert(memberships).values({ userId: id, teamId, role });
  return { id, email, name, role, teamId };
}

/** Inserts a study of `teamId` by `userId`. */
export async function makeStudy(db: Db, teamId: string, userId: string, name = `Study ${randomUUID().slice(0, 8)}`) {
  const [s] = await db
    .insert(studies)
    .values({ teamId, name, content: emptyStudyContent(), createdBy: userId, updatedBy: userId })
    .returning({ id: studies.id, version: studies.version });
  return s;
}

/**
 * Marks a study approved directly in the database (set-up shortcut for tests of templates; the
 * review flow that normally gets there is tested in review.test.ts).
 */
export async function markApproved(db: Db, studyId: string, revision = 1) {
  await db.update(studies).set({ status: 'approved', approvedRevision: revision }).where(eq(studies.id, studyId));
}

/**
 * A supertest agent signed in as `email` (keeps the session cookie). Like a browser on the app, it
 * sends the app's Origin with every request (the server refuses state-changing requests without it).
 */
export async function signedIn(app: TestApp['app'], email: string, password = PASSWORD, origin = APP_URL) {
  const agent = request.agent(app).set('Origin', origin);
  const res = await agent.post('/api/auth/sign-in').send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in of ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return agent;
}

/** Study content whose circuit has `n` single-phase loads on one bus: valid for the engine's parser (not a solvable network). */
export function circuitWith(n: number) {
  return {
    circuit: {
      ...emptyStudyContent().circuit,
      elements: Array.from({ length: n }, (_, i) => ({
        type: 'load',
        id: `LOAD-${i + 1}`,
        bus: 'B1',
        connection: 'single',
        between: ['a', 'n'],
        each: { kw: 1 + i, kvar: 0.1 },
      })),
    },
  };
}

/** Waits (bounded) for the `nth` account mail (sign-up, no team) to `to` and returns its text. */
export async function accountMail(mailer: Mailer, to: string, nth = 1): Promise<{ subject: string; text: string }> {
  for (let i = 0; i < 200; i++) {
    const items = (await mailer.list('')).filter((m) => m.to === to);
    if (items.length >= nth) {
      const m = await mailer.get('', items[items.length - nth].id);
      if (m) return { subject: m.subject, text: m.text };
    }
    await new Promise((r) => setTimeout(r, 25));
  }
  throw new Error(`no account mail to ${to}`);
}

/** Signs up a new team through the API as a person would: request, mailed link, confirmation. Returns the signed-in agent and the answer. */
export async function signUpNewTeam(app: TestApp, body: { name: string; email: string; password: string; teamName: string }) {
  const agent = request.agent(app.app).set('Origin', APP_URL);
  const pending = await agent.post('/api/auth/sign-up').set('Origin', APP_URL).send(body);
  if (pending.status !== 202) throw new Error(`sign-up failed: ${pending.status} ${JSON.stringify(pending.body)}`);
  const mail = await accountMail(app.mailer, body.email.trim().toLowerCase());
  const token = /\/sign-up\/confirm#([A-Za-z0-9_-]+)/.exec(mail.text)?.[1];
  if (!token) throw new Error(`no sign-up link in: ${mail.subject}`);
  const res = await agent.post('/api/auth/sign-up/confirm').set('Origin', APP_URL).send({ token });
  return { agent, res, token };
}
