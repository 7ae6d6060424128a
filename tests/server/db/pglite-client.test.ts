/**
 * The embedded database in its own thread, behind node-postgres (server/db/pglite-client.ts,
 * pglite-thread.ts): the request thread keeps running while PGlite executes a long statement; a
 * connection that goes away in the middle of a transaction leaves nothing behind for the next one;
 * the health probe answers; closing stops the thread with the data written. PGlite only (project
 * server).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, dumpPglite, openDb, pingDb, queryRows, type Db } from '../../../server/db/index.ts';
import { openTestPglite } from '../test-db.ts';

let db: Db;
const poolOf = (d: Db) => (d as unknown as { $client: pg.Pool }).$client;

beforeAll(async () => {
  db = await openTestPglite();
});

afterAll(async () => {
  await closeDb(db).catch(() => {});
});

describe('PGlite in its own thread', () => {
  it('keeps the request thread turning while a long statement runs', async () => {
    let turns = 0;
    let done = false;
    const query = queryRows<{ n: number }>(db, 'select count(*)::int as n from generate_series(1, 3000000) g where g % 7 = 0').finally(() => (done = true));
    const spin = (async () => {
      while (!done) {
        turns++;
        await new Promise((r) => setImmediate(r));
      }
    })();
    const [rows] = await Promise.all([query, spin]);
    expect(rows[0].n).toBe(428571); // ⌊3 000 000 / 7⌋ (C)
    // Running in this thread, PGlite would have blocked it for the whole statement (no turn at all).
    expect(turns).toBeGreaterThan(10);
  });

  it('rolls back a transaction left open by a connection that goes away', async () => {
    await queryRows(db, 'create table left_open (v int)');
    const client = await poolOf(db).connect();
    await client.query('begin');
    await client.query('insert into left_open values (1)');
    client.release(new Error('connection dropped')); // destroys it, mid-transaction
    await queryRows(db, 'insert into left_open values (2)'); // a new connection, outside any transaction
    // Left open, the first insert would show here (one session) and the second would roll back with it later.
    expect(await queryRows(db, 'select v from left_open order by v')).toEqual([{ v: 2 }]);
  });

  it('keeps parameterised statements prepared per connection, and a new connection starts without the last one’s', async () => {
    const text = 'select $1::int + 1 as n';
    const names = async () => (await queryRows<{ name: string; statement: string }>(db, 'select name, statement from pg_prepared_statements')).filter((r) => r.statement === text);
    expect(await queryRows(db, text, [1])).toEqual([{ n: 2 }]);
    expect(await queryRows(db, text, [2])).toEqual([{ n: 3 }]);
    expect(await names()).toHaveLength(1); // parsed once, used twice
    const client = await poolOf(db).connect();
    client.release(new Error('connection dropped'));
    // The next connection names the same text the same way: without the deallocation, PGlite would refuse it as existing.
    expect(await queryRows(db, text, [3])).toEqual([{ n: 4 }]);
    expect(await names()).toHaveLength(1);
  });

  it('moves a large parameter to the thread as written and stores it unchanged, in a batch with small messages', async () => {
    await queryRows(db, 'create table big_params (id int primary key, body jsonb not null, note text not null)');
    // ~2 MB of JSON text with characters of several byte lengths in UTF-8
    const value = { rows: Array.from({ length: 20_000 }, (_, i) => ({ i, name: `Ström Ω 電 ${i}`, x: i / 7 })) };
    const text = JSON.stringify(value);
    expect(Buffer.byteLength(text)).toBeGreaterThan(1_000_000);
    await queryRows(db, 'insert into big_params (id, body, note) values ($1, $2::jsonb, $3)', [1, text, 'small beside it']);
    const [row] = await queryRows<{ body: unknown; note: string; n: number }>(db, 'select body, note, jsonb_array_length(body->\'rows\')::int as n from big_params where id = $1', [1]);
    expect(row.n).toBe(20_000);
    expect(row.note).toBe('small beside it');
    expect(row.body).toStrictEqual(value);
    // and the connection goes on with small statements after it
    expect(await queryRows(db, 'select $1::int + 1 as n', [41])).toEqual([{ n: 42 }]);
  });

  it('answers the health probe between statements and inside another connection’s transaction', async () => {
    await expect(pingDb(db)).resolves.toBeUndefined();
    const client = await poolOf(db).connect();
    try {
      await client.query('begin');
      await expect(pingDb(db)).resolves.toBeUndefined();
      await client.query('rollback');
    } finally {
      client.release();
    }
  });

  it('closes PGlite and stops the thread, the data written; reopens it from a dump too', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-pglite-thread-'));
    try {
      const own = await openTestPglite(dir);
      await queryRows(own, "insert into teams (id, name) values (gen_random_uuid(), 'Kept across close')");
      const dump = await dumpPglite(own);
      await closeDb(own);
      await expect(pingDb(own)).rejects.toThrow(); // the thread is gone
      const again = await openDb({ dataDir: dir, migrate: false });
      expect(await queryRows(again, "select name from teams where name = 'Kept across close'")).toHaveLength(1);
      await closeDb(again);
      const copy = await openDb({ loadDataDir: dump, migrate: false });
      expect(await queryRows(copy, "select name from teams where name = 'Kept across close'")).toHaveLength(1);
      await closeDb(copy);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
