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
 * Opens PGlite at `dataDir` (a directory; created with its parents, STACK.md E5), or in memory when
 * absent; `loadDataDir` starts from a dumped data directory (used by tests). Applies pending migrations.
 */
export async function openDb({ dataDir, loadDataDir }: { dataDir?: string; loadDataDir?: Blob | File } = {}) {
  if (dataDir) mkdirSync(dataDir, { recursive: true });
  const client = new PGlite({ dataDir, loadDataDir });
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
