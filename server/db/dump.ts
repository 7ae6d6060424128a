/**
 * Moving a whole database between the embedded PGlite and a PostgreSQL server (either way):
 * `npm run db:export` / `npm run db:import` (server/cli/db-transfer.ts).
 *
 * The file is newline-delimited JSON, written through the query layer both databases share:
 *   1. a header: `{ "format": "wyeward-database", "version": 1, "migrations": n, "exportedAt", "tables": [...] }`;
 *   2. one line per row: `{ "t": "<table>", "r": <row> }`, the row as PostgreSQL's own `to_jsonb(row)`,
 *      so every value keeps its exact form (timestamps to the microsecond in UTC, jsonb as stored);
 *   3. a closing line `{ "end": true, "counts": { "<table>": n, … } }`: a cut-off file is refused.
 * Import writes rows back with `jsonb_populate_recordset`, table by table in foreign-key order, in
 * one transaction, into a database that has the same migrations and no data yet: all or nothing.
 * The export reads one consistent snapshot (a repeatable-read transaction), so it may run while a
 * server on PostgreSQL is serving (PGlite is single-process: stop the app first).
 */
import { getTableConfig, type PgTable } from 'drizzle-orm/pg-core';
import { sql } from 'drizzle-orm';
import type { Db } from './index.ts';
import * as schema from './schema.ts';

/** Every table of the schema, parents before children (the order rows are inserted in). */
export const TABLES_IN_ORDER: PgTable[] = [
  schema.users,
  schema.teams,
  schema.memberships,
  schema.sessions,
  schema.authThrottle,
  schema.signUpRequests,
  schema.studies,
  schema.invites,
  schema.auditEvents,
  schema.studyRevisions,
  schema.reviewEvents,
  schema.comments,
  schema.notifications,
  schema.attachments,
  schema.mailMessages,
  schema.jobs,
  schema.sweepJobs,
  schema.sweepChunks,
];

export const DUMP_FORMAT = 'wyeward-database';
export const DUMP_VERSION = 1;

/** Rows read per query while exporting (studies and revisions hold up to 2 MB of jsonb each). */
const EXPORT_PAGE = 100;
/** Rows (or about this many characters) sent per insert while importing. */
const IMPORT_BATCH_ROWS = 500;
const IMPORT_BATCH_CHARS = 8_000_000;

interface TableInfo {
  name: string;
  /** The primary-key column and its SQL type (rows are read in its order, page after page). */
  key: string;
  keyType: string;
}

function tableInfo(t: PgTable): TableInfo {
  const c = getTableConfig(t);
  const key = c.columns.find((col) => col.primary);
  if (!key) throw new Error(`table ${c.name} has no single-column primary key`);
  return { name: c.name, key: key.name, keyType: key.getSQLType() };
}

const ident = (s: string) => sql.raw(`"${s.replace(/"/g, '""')}"`);

/**
 * The order rows are written in: the primary key, text keys byte by byte (collation "C"), so the same
 * rows give the same file on any server whatever its locale (uuid keys already sort that way, on their index).
 */
const keyOf = (t: TableInfo) => (t.keyType === 'text' ? sql`${ident(t.key)} collate "C"` : ident(t.key));
const cast = (t: TableInfo, value: string) => (t.keyType === 'text' ? sql`${value}::text collate "C"` : sql`cast(${value} as ${sql.raw(t.keyType)})`);

/** Rows of a raw query on a Drizzle client or transaction (both drivers answer with `rows`). */
async function rowsOf<T>(conn: Pick<Db, 'execute'>, query: ReturnType<typeof sql>): Promise<T[]> {
  return ((await conn.execute(query)) as unknown as { rows: T[] }).rows;
}

/** How many migrations the database has applied (both ends of a move must agree). */
export async function appliedMigrations(db: Pick<Db, 'execute'>): Promise<number> {
  const [r] = await rowsOf<{ n: number }>(db, sql`select count(*)::int as n from drizzle.__drizzle_migrations`);
  return r.n;
}

export type DumpCounts = Record<string, number>;

/** Writes the whole database as dump lines (each without its newline) to `write`, which may wait (back-pressure). */
export async function exportDatabase(db: Db, write: (line: string) => Promise<void> | void): Promise<DumpCounts> {
  const tables = TABLES_IN_ORDER.map(tableInfo);
  const counts: DumpCounts = {};
  await db.transaction(
    async (tx) => {
      await tx.execute(sql`set local time zone 'UTC'`);
      await write(
        JSON.stringify({ format: DUMP_FORMAT, version: DUMP_VERSION, migrations: await appliedMigrations(tx), exportedAt: new Date().toISOString(), tables: tables.map((t) => t.name) }),
      );
      for (const t of tables) {
        counts[t.name] = 0;
        let after: string | null = null;
        for (;;) {
          const page: { k: string; r: string }[] = await rowsOf<{ k: string; r: string }>(
            tx,
            sql`select ${ident(t.key)}::text as k, to_jsonb(x)::text as r from ${ident(t.name)} x
                where ${after === null ? sql`true` : sql`${keyOf(t)} > ${after === null ? null : cast(t, after)}`}
                order by ${keyOf(t)} limit ${EXPORT_PAGE}`,
          );
          for (const row of page) await write(`{"t":${JSON.stringify(t.name)},"r":${row.r}}`);
          counts[t.name] += page.length;
          if (page.length < EXPORT_PAGE) break;
          after = page[page.length - 1].k;
        }
      }
      await write(JSON.stringify({ end: true, counts }));
    },
    { isolationLevel: 'repeatable read', accessMode: 'read only' },
  );
  return counts;
}

/** A problem with the dump or the target that the person running the import must fix (CLI exit code 2). */
export class DumpError extends Error {
  override name = 'DumpError';
}

/** Rows already in the database, per table (an import needs an empty one). */
export async function tableCounts(db: Pick<Db, 'execute'>): Promise<DumpCounts> {
  const counts: DumpCounts = {};
  for (const t of TABLES_IN_ORDER.map(tableInfo)) {
    const [r] = await rowsOf<{ n: number }>(db, sql`select count(*)::int as n from ${ident(t.name)}`);
    counts[t.name] = r.n;
  }
  return counts;
}

/**
 * Reads dump lines into `db`, which must be migrated to the same point and hold no rows. Everything
 * is written in one transaction: on any problem nothing is kept.
 */
export async function importDatabase(db: Db, lines: AsyncIterable<string>): Promise<DumpCounts> {
  const tables = TABLES_IN_ORDER.map(tableInfo);
  const order = new Map(tables.map((t, i) => [t.name, i]));
  const present = Object.entries(await tableCounts(db)).filter(([, n]) => n > 0);
  if (present.length > 0) {
    throw new DumpError(
      `The target database already holds data (${present.map(([t, n]) => `${n} in ${t}`).join(', ')}); import into a new, empty database (the app creates its tables at start, or the import does).`,
    );
  }
  const targetMigrations = await appliedMigrations(db);
  const counts: DumpCounts = {};
  let ended: DumpCounts | null = null;
  let lineNo = 0;

  await db.transaction(async (tx) => {
    let header = false;
    let current = -1;
    let batch: string[] = [];
    let batchChars = 0;
    const flush = async () => {
      if (batch.length === 0) return;
      const name = tables[current].name;
      await tx.execute(sql`insert into ${ident(name)} select * from jsonb_populate_recordset(null::${ident(name)}, ${`[${batch.join(',')}]`}::jsonb)`);
      counts[name] = (counts[name] ?? 0) + batch.length;
      batch = [];
      batchChars = 0;
    };
    for await (const raw of lines) {
      lineNo++;
      const line = raw.trim();
      if (line === '') continue;
      if (ended) throw new DumpError(`line ${lineNo}: data after the end of the dump.`);
      let item: { format?: unknown; version?: unknown; migrations?: unknown; t?: unknown; r?: unknown; end?: unknown; counts?: unknown };
      try {
        item = JSON.parse(line);
      } catch {
        throw new DumpError(`line ${lineNo}: not a line of a Wyeward database dump (not JSON).`);
      }
      if (!header) {
        if (item.format !== DUMP_FORMAT || item.version !== DUMP_VERSION) throw new DumpError('This file is not a Wyeward database dump (made by npm run db:export).');
        if (item.migrations !== targetMigrations) {
          throw new DumpError(
            `The dump was made at database version ${String(item.migrations)} and the target is at ${targetMigrations}: run the same Wyeward version at both ends (start the older one once to upgrade its database).`,
          );
        }
        header = true;
        continue;
      }
      if (item.end === true) {
        await flush();
        ended = (item.counts ?? {}) as DumpCounts;
        continue;
      }
      const index = typeof item.t === 'string' ? order.get(item.t) : undefined;
      if (index === undefined || typeof item.r !== 'object' || item.r === null) throw new DumpError(`line ${lineNo}: not a row of a known table.`);
      if (index !== current) {
        if (index < current) throw new DumpError(`line ${lineNo}: rows of ${String(item.t)} after rows of a later table.`);
        await flush();
        current = index;
      }
      const json = JSON.stringify(item.r);
      batch.push(json);
      batchChars += json.length;
      if (batch.length >= IMPORT_BATCH_ROWS || batchChars >= IMPORT_BATCH_CHARS) await flush();
    }
    if (!header) throw new DumpError('The file is empty.');
    if (!ended) throw new DumpError('The dump is cut off (no closing line): nothing was imported.');
    for (const t of tables) {
      if ((ended[t.name] ?? 0) !== (counts[t.name] ?? 0)) {
        throw new DumpError(`The dump says ${ended[t.name] ?? 0} rows of ${t.name} and holds ${counts[t.name] ?? 0}: nothing was imported.`);
      }
    }
  });
  for (const t of tables) counts[t.name] ??= 0;
  return counts;
}
