/**
 * Opens the database and returns the Drizzle client: a PostgreSQL server through node-postgres
 * (`pg`) when a connection string is given (DATABASE_URL), else the embedded PGlite (on disk under
 * DATA_DIR, or in memory), which runs in its own worker thread and is reached through node-postgres
 * too (pglite-client.ts), so both are the same driver, pool and Drizzle client. Both get the same
 * schema and the same migrations, applied by one runner (`applyMigrations`); services only ever
 * see `Db`.
 */
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import type { PgDatabase, PgQueryResultHKT } from 'drizzle-orm/pg-core';
import { drizzle as drizzlePg } from 'drizzle-orm/node-postgres';
import { migrate as migratePg } from 'drizzle-orm/node-postgres/migrator';
import pg from 'pg';
import { startPgliteThread } from './pglite-client.ts';
import * as schema from './schema.ts';

/** Absolute path of the generated migrations (./drizzle at the project root). */
export const MIGRATIONS_DIR = path.resolve(import.meta.dirname, '..', '..', 'drizzle');

/** The query layer every service uses, whichever database runs underneath. */
export type Db = PgDatabase<PgQueryResultHKT, typeof schema>;

/** Which database a `Db` talks to (for start-up messages, health and the export tool; never for service logic). */
export type DbKind = 'pglite' | 'postgres';

interface Handle {
  kind: DbKind;
  /** A plain parameterised query (`$1` …); rows as the driver's own type parsers give them. */
  query<T>(text: string, params?: unknown[]): Promise<T[]>;
  /** The health probe. */
  ping(): Promise<void>;
  /** PGlite: its data directory as a gzipped tarball. */
  dump?(): Promise<Blob>;
  close(): Promise<void>;
}

const handles = new WeakMap<Db, Handle>();

function handleOf(db: Db): Handle {
  const h = handles.get(db);
  if (!h) throw new Error('not a database opened by openDb');
  return h;
}

/**
 * PostgreSQL settings of the embedded database (README "Database settings"). PGlite's defaults are
 * a server's (shared_buffers 128 MB, maintenance_work_mem 64 MB …); in one process next to the app
 * they only hold memory: the whole working set of a team's studies fits in far less. Applied at
 * every start; PGlite is single-user, so these are per process.
 */
export const POSTGRES_SETTINGS = [
  'shared_buffers = 16MB', // the page cache inside the WASM heap (default 128MB)
  'wal_buffers = 1MB', // default 4MB
  'temp_buffers = 2MB', // default 8MB
  'work_mem = 4MB', // per sort/hash; the largest queries sort a page of studies or audit events
  'maintenance_work_mem = 16MB', // CREATE INDEX in migrations (default 64MB)
];

/** Connections of one app instance to a PostgreSQL server when DATABASE_POOL_MAX is not set. */
export const DEFAULT_POOL_MAX = 10;

/**
 * Key of the session-level advisory lock held while migrations run on a PostgreSQL server, so that
 * instances starting at once apply them one after the other (the later ones then find nothing to do).
 * Any fixed 64-bit number unlikely to be used by another application on the same database.
 */
export const MIGRATION_LOCK_KEY = 7_356_012_441;

export interface OpenDbOptions {
  /** A PostgreSQL connection string (DATABASE_URL). When set, `dataDir` and `loadDataDir` are ignored. */
  url?: string;
  /** Most connections in the pool (DATABASE_POOL_MAX; PostgreSQL only). */
  poolMax?: number;
  /** PGlite: a directory (created with its parents), or in memory when absent. */
  dataDir?: string;
  /** PGlite: start from a dumped data directory (used by tests). */
  loadDataDir?: Blob | File;
  /** Apply pending migrations (default true). */
  migrate?: boolean;
}

/** Opens the database described by `options` and applies pending migrations. */
export async function openDb(options: OpenDbOptions = {}): Promise<Db> {
  const db = options.url ? await openPostgres(options.url, options.poolMax ?? DEFAULT_POOL_MAX) : await openPglite(options);
  if (options.migrate !== false) {
    try {
      await applyMigrations(db);
    } catch (err) {
      await closeDb(db);
      throw err;
    }
  }
  return db;
}

async function openPglite({ dataDir, loadDataDir }: OpenDbOptions): Promise<Db> {
  if (dataDir) mkdirSync(dataDir, { recursive: true });
  const thread = await startPgliteThread({ dataDir, loadDataDir, settings: POSTGRES_SETTINGS });
  const { pool } = thread;
  const db = drizzlePg({ client: pool, schema });
  handles.set(db, {
    kind: 'pglite',
    query: async <T>(text: string, params?: unknown[]) => (await pool.query(text, params)).rows as T[],
    ping: () => thread.ping(),
    dump: () => thread.dump(),
    close: () => thread.close(),
  });
  return db;
}

async function openPostgres(url: string, max: number): Promise<Db> {
  const pool = new pg.Pool({ connectionString: url, max, connectionTimeoutMillis: 10_000, idleTimeoutMillis: 30_000 });
  // An idle connection dropped by the server (restart, failover) is reported here; without a
  // listener it would crash the process. The pool replaces it on the next query.
  pool.on('error', (err) => console.error(`Database connection lost (${(err as { code?: string }).code ?? err.name}); the pool will reconnect.`));
  // Fail at start, with the server's own words, when the URL is wrong or the server is down.
  const probe = await pool.connect().catch(async (err: unknown) => {
    await pool.end();
    throw new Error(`Cannot connect to the PostgreSQL server of DATABASE_URL (${describeConnection(url)}): ${(err as Error).message}`);
  });
  probe.release();
  const db = drizzlePg({ client: pool, schema });
  handles.set(db, {
    kind: 'postgres',
    query: async <T>(text: string, params?: unknown[]) => (await pool.query(text, params)).rows as T[],
    ping: async () => {
      await pool.query('select 1');
    },
    close: () => pool.end(),
  });
  return db;
}

/** `host:port/database` of a connection string, without user or password (for messages). */
export function describeConnection(url: string): string {
  try {
    const u = new URL(url);
    return `${u.hostname}:${u.port || '5432'}${u.pathname}`;
  } catch {
    return 'an unreadable connection string';
  }
}

/**
 * Applies pending migrations from ./drizzle. On a PostgreSQL server it holds an advisory lock on
 * one connection for the whole run, so several instances starting together migrate once (PGlite
 * belongs to one process: no lock).
 */
export async function applyMigrations(db: Db): Promise<void> {
  const h = handleOf(db);
  const pool = (db as unknown as { $client: pg.Pool }).$client;
  const conn = await pool.connect();
  try {
    if (h.kind === 'pglite') {
      await migratePg(drizzlePg({ client: conn }), { migrationsFolder: MIGRATIONS_DIR });
      return;
    }
    await conn.query('select pg_advisory_lock($1)', [MIGRATION_LOCK_KEY]);
    try {
      await migratePg(drizzlePg({ client: conn }), { migrationsFolder: MIGRATIONS_DIR });
    } finally {
      await conn.query('select pg_advisory_unlock($1)', [MIGRATION_LOCK_KEY]);
    }
  } finally {
    conn.release();
  }
}

/** Which database `db` talks to. */
export function dbKind(db: Db): DbKind {
  return handleOf(db).kind;
}

/**
 * A parameterised SQL query outside the schema (tests, the export tool, health). Row values are as
 * the driver parses them: timestamps are Dates and jsonb is parsed on both; cast counts to int.
 */
export function queryRows<T = Record<string, unknown>>(db: Db, text: string, params?: unknown[]): Promise<T[]> {
  return handleOf(db).query<T>(text, params);
}

/**
 * The health check: PostgreSQL runs `select 1`; the embedded database's thread answers a round
 * trip (pglite-client.ts `ping`: `select 1` between statements, at once while a statement it has
 * just begun is running).
 */
export function pingDb(db: Db): Promise<void> {
  return handleOf(db).ping();
}

/** Closes the database cleanly: PGlite's files, or every connection of the pool (call on shutdown). */
export async function closeDb(db: Db): Promise<void> {
  await handleOf(db).close();
}

/** The embedded database's data directory as a gzipped tarball (tests keep a migrated one as a template); throws on a PostgreSQL server. */
export function dumpPglite(db: Db): Promise<Blob> {
  const h = handleOf(db);
  if (!h.dump) throw new Error('not an embedded database');
  return h.dump();
}

export { schema };
