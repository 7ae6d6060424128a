/** Opens the PGlite database (on disk or in memory), applies migrations and returns the Drizzle client. */
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { drizzle } from 'drizzle-orm/pglite';
import { migrate } from 'drizzle-orm/pglite/migrator';
import * as schema from './schema.ts';

/** Absolute path of the generated migrations (./drizzle at the project root). */
export const MIGRATIONS_DIR = path.resolve(import.meta.dirname, '..', '..', 'drizzle');

export type Db = Awaited<ReturnType<typeof openDb>>;

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

/**
 * Opens PGlite at `dataDir` (a directory; created with its parents: PGlite needs the parent directory to exist), or in memory when
 * absent; `loadDataDir` starts from a dumped data directory (used by tests). Applies pending migrations.
 */
export async function openDb({ dataDir, loadDataDir }: { dataDir?: string; loadDataDir?: Blob | File } = {}) {
  if (dataDir) mkdirSync(dataDir, { recursive: true });
  const client = new PGlite({ dataDir, loadDataDir, postgresqlconf: POSTGRES_SETTINGS });
  await client.waitReady;
  const db = drizzle({ client, schema });
  await migrate(db, { migrationsFolder: MIGRATIONS_DIR });
  return db;
}

/** Closes the database cleanly (call on shutdown). */
export async function closeDb(db: Db): Promise<void> {
  await db.$client.close();
}

export { schema };
