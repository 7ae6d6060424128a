/**
 * Opens a fresh, migrated database for one test file: in project server an in-memory PGlite from
 * the template made in global-setup.ts; in project server-pg a new database on the throwaway
 * PostgreSQL server, copied from its migrated template (pg-global-setup.ts).
 */
import { randomUUID } from 'node:crypto';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { inject } from 'vitest';
import { closeDb, openDb, type Db } from '../../server/db/index.ts';
import { adminQuery } from './pg/cluster.ts';

/** Connections each test file's pool may open (the throwaway server allows 300 in all). */
const TEST_POOL_MAX = 4;

/** The migrated PGlite template as a Blob (for PGlite's `loadDataDir`). */
export function templateBlob(): Blob {
  return new Blob([readFileSync(inject('pgTemplate'))]);
}

/** True in project server-pg (tests run against a PostgreSQL server). */
export function onPostgres(): boolean {
  return inject('pgServer') !== '';
}

/** Project server-pg: creates a new migrated database on the test server and returns its connection string. */
export async function newPostgresDatabase(): Promise<string> {
  const server = inject('pgServer');
  const name = `t_${randomUUID().replace(/-/g, '').slice(0, 20)}`;
  await adminQuery(server, `create database ${name} template wyeward_template`);
  const u = new URL(server);
  u.pathname = `/${name}`;
  return u.toString();
}

/** A new in-memory PGlite from the template, whichever project runs (for tests that move data between the two). */
export function openTestPglite(dataDir?: string): Promise<Db> {
  return openDb({ dataDir, loadDataDir: templateBlob() });
}

/** A new database of this project's kind: in-memory PGlite, or a new database on the PostgreSQL test server. */
export async function openTestDb(): Promise<Db> {
  if (onPostgres()) return openDb({ url: await newPostgresDatabase(), poolMax: TEST_POOL_MAX });
  return openTestPglite();
}

/**
 * Environment of a fresh, migrated store for code that opens the database itself from its
 * configuration (prepareDatabase): DATABASE_URL of a new database on the test server, or nothing
 * (PGlite under DATA_DIR, started from the template so as to skip an initdb).
 */
export async function freshStoreEnv(dataDir: string): Promise<Record<string, string>> {
  if (onPostgres()) return { DATABASE_URL: await newPostgresDatabase(), DATABASE_POOL_MAX: String(TEST_POOL_MAX) };
  await closeDb(await openTestPglite(path.join(dataDir, 'pglite')));
  return {};
}
