/**
 * Project server-pg only: several instances starting at once on an empty PostgreSQL database
 * migrate it once — the migration runner holds an advisory lock.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, inject, it } from 'vitest';
import { closeDb, MIGRATIONS_DIR, openDb, queryRows } from '../../../server/db/index.ts';
import { adminQuery } from './cluster.ts';

describe('migrations on a PostgreSQL server', () => {
  it('migrates an empty database once when several instances start at the same moment (advisory lock)', async () => {
    const server = inject('pgServer');
    const name = `empty_${Date.now().toString(36)}`;
    await adminQuery(server, `create database ${name}`);
    const u = new URL(server);
    u.pathname = `/${name}`;
    const instances = await Promise.all(Array.from({ length: 4 }, () => openDb({ url: u.toString(), poolMax: 2 })));
    const journal = JSON.parse(readFileSync(path.join(MIGRATIONS_DIR, 'meta', '_journal.json'), 'utf8')) as { entries: unknown[] };
    const [applied] = await queryRows<{ n: number }>(instances[0], 'select count(*)::int as n from drizzle.__drizzle_migrations');
    expect(applied.n).toBe(journal.entries.length);
    expect(applied.n).toBeGreaterThanOrEqual(4);
    const [tables] = await queryRows<{ n: number }>(instances[1], `select count(*)::int as n from information_schema.tables where table_schema = 'public'`);
    expect(tables.n).toBeGreaterThanOrEqual(14);
    for (const i of instances) await closeDb(i);
  });
});
