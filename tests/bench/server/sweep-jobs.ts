/**
 * `node --import tsx tests/bench/server/sweep-jobs.ts`: server sweep jobs end to end on the real
 * server (prints figures only, with the machine's load): a sweep of one load's kW on the invented
 * open-neutral demo (two outputs recorded) posted through the API, polled until done; then pages of
 * 1 000 points read back from the database. BENCH_SWEEP_POINTS (default 20000) sets its size;
 * BENCH_DATABASE=postgres runs the server on a throwaway PostgreSQL cluster instead of the
 * embedded database (and prints the size of the stored points).
 */
import pg from 'pg';
import { demoCircuits } from '../../../shared/engine/index.ts';
import { machineLoad, percentile, session, startServer } from './harness.ts';

const POINTS = Number(process.env.BENCH_SWEEP_POINTS ?? 20_000);
const circuit = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;

const server = await startServer();
try {
  const headers = await session(server.url);
  const made = await fetch(`${server.url}/api/studies`, { method: 'POST', headers, body: JSON.stringify({ name: 'Bench sweep', content: { circuit } }) });
  const studyId = ((await made.json()) as { id: string }).id;
  const sweeps = `${server.url}/api/studies/${studyId}/sweeps`;
  const post = async (points: number) => {
    const res = await fetch(sweeps, { method: 'POST', headers, body: JSON.stringify({ parameters: [{ path: 'KITCHEN.each.kw', from: 0.5, to: 6, points }], outputs: ['load:KITCHEN:an', 'shift:HOUSE'] }) });
    if (res.status !== 202) throw new Error(`POST answered ${res.status}: ${await res.text()}`);
    return ((await res.json()) as { id: string }).id;
  };
  const wait = async (id: string) => {
    for (;;) {
      const job = (await (await fetch(`${sweeps}/${id}?limit=0`, { headers })).json()) as { status: string; done: number };
      if (job.status !== 'running') return job;
      await new Promise((r) => setTimeout(r, 100));
    }
  };
  await wait(await post(500)); // warm up: the work thread starts, the first solves
  console.log(`before: ${machineLoad()}`);
  const t0 = performance.now();
  const id = await post(POINTS);
  const job = await wait(id);
  const seconds = (performance.now() - t0) / 1000;
  console.log(`${POINTS} points of the ${circuit.elements.length}-element demo, 2 outputs: ${job.status} in ${seconds.toFixed(1)} s (${Math.round(job.done / seconds)} points/s, stored in the database batch by batch)`);
  const reads: number[] = [];
  for (let i = 0; i < 20; i++) {
    const t = performance.now();
    const res = await fetch(`${sweeps}/${id}?offset=${(i * 997) % Math.max(1, POINTS - 1000)}&limit=1000`, { headers });
    await res.arrayBuffer();
    reads.push(performance.now() - t);
  }
  console.log(`GET of 1 000 points (20 reads): median ${percentile(reads, 50).toFixed(1)} ms, p90 ${percentile(reads, 90).toFixed(1)} ms`);
  if (server.databaseUrl) {
    const sql = new pg.Client({ connectionString: server.databaseUrl });
    await sql.connect();
    const { rows } = await sql.query(`select pg_total_relation_size('sweep_chunks')::bigint as bytes, (select count(*) from sweep_chunks)::int as chunks`);
    console.log(`stored points: ${rows[0].chunks} chunks, ${(Number(rows[0].bytes) / 1024).toFixed(0)} kB for ${POINTS + 500} points (${(Number(rows[0].bytes) / (POINTS + 500)).toFixed(0)} bytes per point with 2 outputs)`);
    await sql.end();
  }
  console.log(`database: ${server.database}`);
  console.log(`after: ${machineLoad()}`);
} finally {
  await server.stop();
}
