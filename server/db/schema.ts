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

/** lucia 3 sessions. */
export const sessions = pgTable('sessions', {
  id: text('id').primaryKey(),
  userId: text('user_id')
    .notNull()
    .references(() => users.id, { onDelete: 'cascade' }),
  expiresAt: ts('expires_at').notNull(),
});

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
