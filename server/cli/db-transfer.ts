/**
 * `npm run db:export -- <file>` and `npm run db:import -- <file>`: move every row of the configured
 * database (DATABASE_URL, else the embedded one under DATA_DIR) to a file and from a file into
 * another, empty database, either way between PGlite and a PostgreSQL server (format and rules in
 * server/db/dump.ts). Stop the app first when the database is the embedded one (single-process).
 * Exit codes: 0 done, 2 bad usage, file or target (nothing imported), 1 anything else.
 */
import { once } from 'node:events';
import { createReadStream, createWriteStream, existsSync, renameSync, rmSync } from 'node:fs';
import { createInterface } from 'node:readline';
import { readConfig } from '../config.ts';
import { closeDb } from '../db/index.ts';
import { DumpError, exportDatabase, importDatabase, type DumpCounts } from '../db/dump.ts';
import { databaseLabel, openConfiguredDb } from '../runtime.ts';

const USAGE = 'usage: npm run db:export -- <file>   |   npm run db:import -- <file>';

function summary(counts: DumpCounts): string {
  return Object.entries(counts)
    .map(([t, n]) => `  ${t.padEnd(18)} ${n}`)
    .join('\n');
}

/**
 * The file's lines, read only once iteration starts: a readline interface made earlier would read
 * (and drop) lines while the import is still checking the target.
 */
async function* fileLines(file: string): AsyncGenerator<string> {
  const rl = createInterface({ input: createReadStream(file, 'utf8'), crlfDelay: Infinity });
  try {
    for await (const line of rl) yield line;
  } finally {
    rl.close();
  }
}

async function main(): Promise<number> {
  const [command, file, ...rest] = process.argv.slice(2);
  if (!['export', 'import'].includes(command ?? '') || !file || rest.length > 0) {
    console.error(USAGE);
    return 2;
  }
  let config;
  try {
    config = readConfig();
  } catch (err) {
    console.error((err as Error).message);
    return 2;
  }
  if (command === 'export' && existsSync(file)) {
    console.error(`${file} already exists; name a new file.`);
    return 2;
  }
  if (command === 'import' && !existsSync(file)) {
    console.error(`${file} does not exist.`);
    return 2;
  }
  const db = await openConfiguredDb(config);
  try {
    if (command === 'export') {
      // Written beside the target and renamed at the end, so a failed export leaves no half file.
      const partial = `${file}.partial`;
      const out = createWriteStream(partial);
      try {
        const counts = await exportDatabase(db, async (line) => {
          if (!out.write(`${line}\n`)) await once(out, 'drain');
        });
        out.end();
        await once(out, 'finish');
        renameSync(partial, file);
        console.log(`Exported the ${databaseLabel(config)} to ${file}:\n${summary(counts)}`);
      } catch (err) {
        out.destroy();
        rmSync(partial, { force: true });
        throw err;
      }
    } else {
      const counts = await importDatabase(db, fileLines(file));
      console.log(`Imported ${file} into the ${databaseLabel(config)}:\n${summary(counts)}`);
    }
    return 0;
  } catch (err) {
    if (err instanceof DumpError) {
      console.error(err.message);
      return 2;
    }
    throw err;
  } finally {
    await closeDb(db);
  }
}

main().then(
  (code) => process.exit(code),
  (err: unknown) => {
    // The driver's own words (a query error's message would quote the query and its parameters: whole rows).
    const cause = (err as { cause?: unknown }).cause;
    const why = cause instanceof Error ? cause.message : (err as Error).message;
    console.error(`db:${process.argv[2]} failed: ${why.slice(0, 500)}`);
    process.exit(1);
  },
);
