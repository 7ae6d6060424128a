/**
 * Creates the embedded database in a new data directory, in a process of its own that exits when
 * done (runtime.ts starts it on a first start): `node --import tsx server/db/create-embedded.ts
 * <dataDir> <demo: 0|1>`. PGlite's initdb, the migrations and the demo seed grow its WASM heap to
 * several hundred MB (measured: RSS about 700 MB with initdb and migrations alone), and a worker
 * thread's exit does not give all of that back to the system; a process's exit does. Prints one
 * line of JSON: the seed's result.
 */
import { closeDb, openDb } from './index.ts';
import { seedDemo } from './seed.ts';

const [dataDir, demo] = process.argv.slice(2);
if (!dataDir) {
  console.error('usage: create-embedded.ts <dataDir> <demo: 0|1>');
  process.exit(2);
}
const db = await openDb({ dataDir });
try {
  const seeded = demo === '1' ? await seedDemo(db) : null;
  console.log(JSON.stringify({ seeded }));
} finally {
  await closeDb(db);
}
