/**
 * `node --import tsx tests/bench/server/import-health.ts`: /api/health latency while 2 MB study
 * imports run (issue target: p99 < 20 ms). Starts the real server on loopback with a fresh
 * database, imports a seeded random feeder of about 2 MB several times in a row, and meanwhile
 * asks /api/health/live (the event loop only) and /api/health (which also runs a query on the
 * database) in turn every 5 ms. Prints figures only, with the machine's load.
 * BENCH_IMPORTS (default 5) sets the number of imports; BENCH_DATABASE=postgres runs the server on a
 * throwaway PostgreSQL cluster (DATABASE_URL) instead of the embedded database.
 */
import { radialFeeder } from '../feeder.ts';
import { machineLoad, percentile, session, startServer } from './harness.ts';

const IMPORTS = Number(process.env.BENCH_IMPORTS ?? 5);

/** A feeder whose import file is just under `mb` megabytes (the file grows about linearly with the buses). */
function fileOfSize(mb: number) {
  const target = mb * 1024 * 1024;
  const make = (buses: number) => {
    const circuit = radialFeeder(buses, 7);
    const body = JSON.stringify({ format: 'wyeward-study', version: 1, name: `Bench feeder ${buses} buses`, circuit, layout: { note: 'bench' } });
    return { body, buses, elements: circuit.elements.length };
  };
  const probe = make(400);
  let buses = Math.floor((400 * target) / probe.body.length);
  let file = make(buses);
  while (file.body.length > target && buses > 10) file = make((buses = Math.floor(buses * 0.98)));
  return file;
}

const server = await startServer();
try {
  const headers = await session(server.url);
  const file = fileOfSize(1.95); // just under the 2 MB body limit
  console.log(`study file: ${(file.body.length / 1024 / 1024).toFixed(2)} MB, ${file.buses} buses, ${file.elements} elements`);
  // Warm up (thread start, first solve).
  await fetch(`${server.url}/api/studies/import`, { method: 'POST', headers, body: file.body });

  const latencies: Record<'live' | 'health', number[]> = { live: [], health: [] };
  let running = true;
  const prober = (async () => {
    for (let i = 0; running; i++) {
      const which = i % 2 === 0 ? 'live' : 'health';
      const t = performance.now();
      await (await fetch(`${server.url}${which === 'live' ? '/api/health/live' : '/api/health'}`)).text();
      latencies[which].push(performance.now() - t);
      await new Promise((r) => setTimeout(r, 5));
    }
  })();
  const importTimes: number[] = [];
  for (let i = 0; i < IMPORTS; i++) {
    const t = performance.now();
    const res = await fetch(`${server.url}/api/studies/import`, { method: 'POST', headers, body: file.body });
    if (res.status !== 201) throw new Error(`import answered ${res.status}: ${await res.text()}`);
    importTimes.push(performance.now() - t);
  }
  running = false;
  await prober;
  console.log(`${IMPORTS} imports of ${(file.body.length / 1024 / 1024).toFixed(2)} MB: median ${percentile(importTimes, 50).toFixed(0)} ms each`);
  console.log(`database: ${server.database}`);
  for (const [which, xs] of Object.entries(latencies)) {
    console.log(
      `${which === 'live' ? '/api/health/live (event loop)' : '/api/health (with a database query)'} during the imports: ${xs.length} requests, p50 ${percentile(xs, 50).toFixed(1)} ms, p99 ${percentile(xs, 99).toFixed(1)} ms, max ${Math.max(...xs).toFixed(1)} ms (target p99 < 20 ms)`,
    );
  }
  console.log(machineLoad());
} finally {
  await server.stop();
}
