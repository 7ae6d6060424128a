/** Opens a fresh, migrated PGlite for one test file from the template made in global-setup.ts. */
import { readFileSync } from 'node:fs';
import { inject } from 'vitest';
import { openDb, type Db } from '../../server/db/index.ts';

/** The migrated template as a Blob (for PGlite's `loadDataDir`). */
export function templateBlob(): Blob {
  return new Blob([readFileSync(inject('pgTemplate'))]);
}

/** A new database, in memory, or in `dataDir` on disk when given. */
export function openTestDb(dataDir?: string): Promise<Db> {
  return openDb({ dataDir, loadDataDir: templateBlob() });
}
