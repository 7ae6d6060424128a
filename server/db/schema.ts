/**
 * The database schema (Drizzle, PostgreSQL via PGlite). Migrations in ./drizzle are generated
 * from this file with `npx drizzle-kit generate --name <name>`; never edit them by hand.
 */
import { sql } from 'drizzle-orm';
import { boolean, index, integer, jsonb, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';

const ts = (name: string) => timestamp(name, { withTimezone: true, mode: 'date' });

/** People who can sign in. `id` is text because lucia's adapter expects text user ids. */
export const users = pgTable('users', {
  id: text('id').primaryKey(),
  email: text('email').notNull().unique(),
  name: text('name').notNull(),
  passwordHash: text('password_hash').notNull(),
  createdAt: ts('created_at').notNull().defaultNow(),
});

export const teams = pgTable('teams', {
  id: uuid('id').primaryKey().defaultRandom(),
  name: text('name').notNull(),
  createdAt: ts('created_at').notNull().defaultNow(),
});

/** A user's role in a team. One team per user in this version, hence the primary key on user_id. */
export const memberships = pgTable(
  'memberships',
  {
    userId: text('user_id')
      .primaryKey()
      .references(() => users.id, { onDelete: 'cascade' }),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    role: text('role', { enum: ['owner', 'engineer', 'reviewer', 'viewer'] }).notNull(),
    createdAt: ts('created_at').notNull().defaultNow(),
  },
  (t) => [index('memberships_team_idx').on(t.teamId)],
);

/** lucia 3 sessions. `expiresAt` moves on with use (idle expiry); `createdAt` bounds a session's whole life (absolute maximum). */
export const sessions = pgTable(
  'sessions',
  {
    id: text('id').primaryKey(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    expiresAt: ts('expires_at').notNull(),
    createdAt: ts('created_at').notNull().defaultNow(),
  },
  (t) => [index('sessions_user_idx').on(t.userId)],
);

/**
 * Counters of the sign-in and sign-up throttles (rate-limiter-flexible's Drizzle store: key,
 * points, expiry), kept in the database so a restart does not forget them.
 */
export const authThrottle = pgTable('auth_throttle', {
  key: text('key').primaryKey(),
  points: integer('points').notNull(),
  expire: ts('expire'),
});

/**
 * A sign-up that creates a new team waits here until its e-mail address is confirmed through the
 * link mailed to it; then the account is made. Only the token's SHA-256 is stored.
 */
export const signUpRequests = pgTable(
  'sign_up_requests',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    tokenHash: text('token_hash').notNull(),
    email: text('email').notNull(),
    name: text('name').notNull(),
    teamName: text('team_name').notNull(),
    passwordHash: text('password_hash').notNull(),
    createdAt: ts('created_at').notNull().defaultNow(),
    expiresAt: ts('expires_at').notNull(),
  },
  (t) => [uniqueIndex('sign_up_requests_token_idx').on(t.tokenHash), index('sign_up_requests_expires_idx').on(t.expiresAt)],
);

export const studies = pgTable(
  'studies',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    description: text('description').notNull().default(''),
    /** `{ circuit, layout? }` as in shared/api/studies.ts. */
    content: jsonb('content').notNull(),
    status: text('status', { enum: ['draft', 'in-review', 'changes-requested', 'approved'] })
      .notNull()
      .default('draft'),
    isTemplate: boolean('is_template').notNull().default(false),
    /** Optimistic-concurrency counter: every write must name the version it edited. */
    version: integer('version').notNull().default(1),
    clonedFrom: uuid('cloned_from'),
    /** Revision number of the source study this one was started from. */
    clonedFromRevision: integer('cloned_from_revision'),
    /** Who asked for the current (or last) review, whom they chose, and which revision is under review. */
    reviewRequestedBy: text('review_requested_by').references(() => users.id),
    reviewers: jsonb('reviewers').$type<string[]>().notNull().default([]),
    reviewRevision: integer('review_revision'),
    /** The revision the current approval is bound to (null unless approved). */
    approvedRevision: integer('approved_revision'),
    createdBy: text('created_by')
      .notNull()
      .references(() => users.id),
    updatedBy: text('updated_by')
      .notNull()
      .references(() => users.id),
    createdAt: ts('created_at').notNull().defaultNow(),
    updatedAt: ts('updated_at').notNull().defaultNow(),
    /** Soft delete: set instead of removing the row. */
    deletedAt: ts('deleted_at'),
  },
  (t) => [index('studies_team_idx').on(t.teamId, t.updatedAt), index('studies_name_idx').on(t.teamId, sql`lower(${t.name})`)],
);

/** Invitations by e-mail. Only the SHA-256 of the token is kept, so a database leak does not leak usable links. */
export const invites = pgTable(
  'invites',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    email: text('email').notNull(),
    role: text('role', { enum: ['owner', 'engineer', 'reviewer', 'viewer'] }).notNull(),
    tokenHash: text('token_hash').notNull(),
    invitedBy: text('invited_by')
      .notNull()
      .references(() => users.id),
    createdAt: ts('created_at').notNull().defaultNow(),
    expiresAt: ts('expires_at').notNull(),
    acceptedAt: ts('accepted_at'),
    acceptedBy: text('accepted_by').references(() => users.id),
    revokedAt: ts('revoked_at'),
  },
  (t) => [uniqueIndex('invites_token_hash_idx').on(t.tokenHash), index('invites_team_idx').on(t.teamId)],
);

/** Who did what, when, to which study. */
export const auditEvents = pgTable(
  'audit_events',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    actorId: text('actor_id')
      .notNull()
      .references(() => users.id),
    action: text('action').notNull(),
    studyId: uuid('study_id'),
    detail: jsonb('detail').notNull().default({}),
    at: ts('at').notNull().defaultNow(),
  },
  (t) => [index('audit_team_at_idx').on(t.teamId, t.at), index('audit_study_idx').on(t.studyId)],
);

/** Immutable snapshots of a study's content, one per save, numbered from 1 per study. */
export const studyRevisions = pgTable(
  'study_revisions',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studyId: uuid('study_id')
      .notNull()
      .references(() => studies.id, { onDelete: 'cascade' }),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    number: integer('number').notNull(),
    /** `{ circuit, layout?, settings? }`. */
    content: jsonb('content').notNull(),
    message: text('message').notNull().default(''),
    authorId: text('author_id')
      .notNull()
      .references(() => users.id),
    engineVersion: text('engine_version').notNull(),
    /** ResultsSummary of shared/review/summary.ts. */
    summary: jsonb('summary').notNull(),
    restoredFrom: integer('restored_from'),
    createdAt: ts('created_at').notNull().defaultNow(),
  },
  (t) => [uniqueIndex('study_revisions_number_idx').on(t.studyId, t.number)],
);

/** Every review transition (request, approve, request-changes, reset by an edit), kept for the record. */
export const reviewEvents = pgTable(
  'review_events',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studyId: uuid('study_id')
      .notNull()
      .references(() => studies.id, { onDelete: 'cascade' }),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    actorId: text('actor_id')
      .notNull()
      .references(() => users.id),
    action: text('action', { enum: ['request', 'approve', 'request-changes', 'reset'] }).notNull(),
    fromStatus: text('from_status').notNull(),
    toStatus: text('to_status').notNull(),
    revision: integer('revision'),
    reviewers: jsonb('reviewers').$type<string[]>().notNull().default([]),
    message: text('message').notNull().default(''),
    /** On an approval: how many violations the approver acknowledged (null when the revision had none). */
    acknowledgedViolations: integer('acknowledged_violations'),
    at: ts('at').notNull().defaultNow(),
  },
  (t) => [index('review_events_study_idx').on(t.studyId, t.at)],
);

/** Comment threads on a study; plain text, optionally anchored to an element id or a result row. */
export const comments = pgTable(
  'comments',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studyId: uuid('study_id')
      .notNull()
      .references(() => studies.id, { onDelete: 'cascade' }),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    parentId: uuid('parent_id'),
    authorId: text('author_id')
      .notNull()
      .references(() => users.id),
    body: text('body').notNull(),
    anchor: jsonb('anchor'),
    revision: integer('revision'),
    mentions: jsonb('mentions').$type<string[]>().notNull().default([]),
    resolvedAt: ts('resolved_at'),
    resolvedBy: text('resolved_by').references(() => users.id),
    createdAt: ts('created_at').notNull().defaultNow(),
    editedAt: ts('edited_at'),
    deletedAt: ts('deleted_at'),
  },
  (t) => [index('comments_study_idx').on(t.studyId, t.createdAt)],
);

/** In-app notifications of one user. */
export const notifications = pgTable(
  'notifications',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    kind: text('kind', { enum: ['review-requested', 'mention', 'changes-requested', 'approved'] }).notNull(),
    studyId: uuid('study_id').references(() => studies.id, { onDelete: 'cascade' }),
    actorId: text('actor_id')
      .notNull()
      .references(() => users.id),
    text: text('text').notNull(),
    createdAt: ts('created_at').notNull().defaultNow(),
    readAt: ts('read_at'),
  },
  (t) => [index('notifications_user_idx').on(t.userId, t.createdAt)],
);

/** Files attached to a study; the bytes live in the bucket under attachments/<id> (server/storage). */
export const attachments = pgTable(
  'attachments',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    studyId: uuid('study_id')
      .notNull()
      .references(() => studies.id, { onDelete: 'cascade' }),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    fileName: text('file_name').notNull(),
    contentType: text('content_type').notNull(),
    size: integer('size').notNull(),
    uploadedBy: text('uploaded_by')
      .notNull()
      .references(() => users.id),
    createdAt: ts('created_at').notNull().defaultNow(),
  },
  (t) => [index('attachments_study_idx').on(t.studyId, t.createdAt)],
);

/**
 * Outgoing mail: every message the app sends, as owners read it on the Outgoing mail page, with the
 * RFC 822 text that goes over SMTP. Stored when the message is queued, so no link is lost when the
 * SMTP server is down; `deliveredAt` is set once an SMTP server accepted it. `teamId` is '' for
 * mail that belongs to no team (sign-up), so it is plain text rather than a reference.
 */
export const mailMessages = pgTable(
  'mail_messages',
  {
    /** 13-digit epoch milliseconds and random hex: sorts by time (server/mail/store.ts). */
    id: text('id').primaryKey(),
    teamId: text('team_id').notNull(),
    toAddress: text('to_address').notNull(),
    fromAddress: text('from_address').notNull(),
    subject: text('subject').notNull(),
    bodyText: text('body_text').notNull(),
    bodyHtml: text('body_html'),
    raw: text('raw').notNull(),
    createdAt: ts('created_at').notNull().defaultNow(),
    deliveredAt: ts('delivered_at'),
  },
  (t) => [index('mail_messages_team_idx').on(t.teamId, t.id)],
);

/**
 * Background jobs (server/jobs): each is claimed by one app instance at a time with
 * `SELECT … FOR UPDATE SKIP LOCKED` and a lease (`lockedUntil`); a finished job is deleted, a
 * failing one waits (`runAt`) with growing back-off and ends `failed` after `maxAttempts`.
 */
export const jobs = pgTable(
  'jobs',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    kind: text('kind').notNull(),
    payload: jsonb('payload').notNull(),
    status: text('status', { enum: ['queued', 'running', 'failed'] })
      .notNull()
      .default('queued'),
    attempts: integer('attempts').notNull().default(0),
    maxAttempts: integer('max_attempts').notNull().default(10),
    runAt: ts('run_at').notNull().defaultNow(),
    lockedUntil: ts('locked_until'),
    lastError: text('last_error'),
    createdAt: ts('created_at').notNull().defaultNow(),
  },
  (t) => [index('jobs_due_idx').on(t.status, t.runAt)],
);

/**
 * Server sweep jobs (services/sweeps.ts): one row per sweep, run on one study revision (and
 * optionally one of its cases). The run itself is a `sweep.run` job of the jobs table, so exactly
 * one instance runs it; `done` counts the points stored in sweep_chunks, and a run taken over after
 * its instance died goes on from there. `status` `queued` reads as running through the API.
 */
export const sweepJobs = pgTable(
  'sweep_jobs',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    teamId: uuid('team_id')
      .notNull()
      .references(() => teams.id, { onDelete: 'cascade' }),
    studyId: uuid('study_id')
      .notNull()
      .references(() => studies.id, { onDelete: 'cascade' }),
    /** The revision swept (its content is what runs), and its number as people read it. */
    revisionId: uuid('revision_id')
      .notNull()
      .references(() => studyRevisions.id, { onDelete: 'cascade' }),
    revision: integer('revision').notNull(),
    caseId: text('case_id'),
    caseName: text('case_name'),
    /** The parameters as asked: `[{ path, from, to, points, scale }]` (the points' values are derived from them). */
    parameters: jsonb('parameters').notNull(),
    /** What each point records: `[{ key, label, unit, spec }]`. */
    outputs: jsonb('outputs').notNull(),
    total: integer('total').notNull(),
    done: integer('done').notNull().default(0),
    status: text('status', { enum: ['queued', 'running', 'done', 'failed', 'cancelled'] })
      .notNull()
      .default('queued'),
    error: text('error'),
    createdBy: text('created_by')
      .notNull()
      .references(() => users.id),
    /** How many times an instance took the run (1 unless one died or shut down while running it), and the last one. */
    claims: integer('claims').notNull().default(0),
    runner: text('runner'),
    createdAt: ts('created_at').notNull().defaultNow(),
    updatedAt: ts('updated_at').notNull().defaultNow(),
    finishedAt: ts('finished_at'),
  },
  (t) => [index('sweep_jobs_study_idx').on(t.studyId, t.createdAt), index('sweep_jobs_status_idx').on(t.status, t.teamId)],
);

/**
 * Solved points of a sweep job, in chunks of consecutive points from `start`: `rows` holds each
 * point's outputs in order (`[[0.98, 1.02], …]`, null where a value does not exist), `errors` why
 * a point did not solve, by its place in the chunk (`{ "3": "…" }`).
 */
export const sweepChunks = pgTable(
  'sweep_chunks',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    sweepId: uuid('sweep_id')
      .notNull()
      .references(() => sweepJobs.id, { onDelete: 'cascade' }),
    start: integer('start').notNull(),
    count: integer('count').notNull(),
    rows: jsonb('rows').notNull(),
    errors: jsonb('errors'),
    createdAt: ts('created_at').notNull().defaultNow(),
  },
  (t) => [uniqueIndex('sweep_chunks_start_idx').on(t.sweepId, t.start)],
);
