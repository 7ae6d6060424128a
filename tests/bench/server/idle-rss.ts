/**
 * `node --import tsx tests/bench/server/idle-rss.ts`: the server's resident memory when idle (issue
 * target ≤ 300 MB), on the embedded database: a first start on a fresh data directory (initdb,
 * migrations, demo seed) and a restart on that directory, each sampled IDLE_RSS_SECONDS (default
 * 20 and 60) after it answers /api/health, without any request meanwhile. Prints figures only,
 * with the machine's load. The client is built first if stale (harness.ts: so that the server's own
 * build of it, which `npm start` makes in its process, is not counted). BENCH_SERVER_TSX=1 runs
 * the server through tsx instead of its bundle (harness.ts).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { machineLoad, rssMb, startServer } from './harness.ts';

const AT = (process.env.IDLE_RSS_SECONDS ?? '20,60').split(',').map(Number);
const dataDir = mkdtempSync(path.join(tmpdir(), 'wyeward-rss-'));
try {
  for (const run of ['first start (fresh data directory)', 'restart (same data directory)']) {
    const server = await startServer({}, { dataDir });
    const t0 = Date.now();
    const samples: string[] = [];
    for (const s of AT) {
      await new Promise((r) => setTimeout(r, Math.max(0, t0 + s * 1000 - Date.now())));
      samples.push(`${rssMb(server.pid).toFixed(0)} MB at ${s} s`);
    }
    console.log(`${run}: RSS ${samples.join(', ')}; ${machineLoad()}`);
    await server.stop();
  }
} finally {
  rmSync(dataDir, { recursive: true, force: true });
}
