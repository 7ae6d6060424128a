/**
 * `npm run loadtest`: the server under a mixed workload of a busy team, on loopback only. Starts
 * the real server (fresh database, demo team), signs in four demo users, and sends requests at a
 * fixed rate (open loop: a slow answer does not slow the sender) for a bounded time:
 *   40 % study list (page of 20), 20 % one study, 10 % team page, 10 % notifications, 10 % me,
 *    5 % revision list, 5 % a small edit (PATCH name with the current version).
 * Prints req/s achieved, latency p50/p99, errors, the server's CPU per request (from /proc) and its
 * RSS before and after, with the machine's load. Nothing is asserted.
 * LOADTEST_RATE (req/s, default 150), LOADTEST_SECONDS (default 30, at most 900), LOADTEST_CONNECTIONS (default 16).
 * BENCH_DATABASE=postgres runs the server on a throwaway PostgreSQL cluster (DATABASE_URL); the
 * database server's own CPU per request is then printed too. LOADTEST_INSTANCES=2 (with
 * BENCH_DATABASE=postgres) runs two instances on that one database and one shared fake S3 bucket,
 * both told the first one's address as APP_URL (the balancer's); requests take turns between them.
 */
import { mkdtempSync } from 'node:fs';
import { Agent, request } from 'node:http';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { LOCAL_S3_CREDENTIALS, startLocalS3 } from '../../../server/storage/local-s3.ts';
import { clusterCpuMs, cpuMs, machineLoad, percentile, rssMb, session, startServer, threadCpuMs, threadSplit, type BenchServer } from './harness.ts';

const RATE = Number(process.env.LOADTEST_RATE ?? 150);
const SECONDS = Math.min(900, Number(process.env.LOADTEST_SECONDS ?? 30));
const CONNECTIONS = Number(process.env.LOADTEST_CONNECTIONS ?? 16);

const INSTANCES = Number(process.env.LOADTEST_INSTANCES ?? 1);
if (![1, 2].includes(INSTANCES)) throw new Error('LOADTEST_INSTANCES is 1 or 2');
if (INSTANCES > 1 && process.env.BENCH_DATABASE !== 'postgres') throw new Error('two instances need one database server: set BENCH_DATABASE=postgres');
const bucket = INSTANCES > 1 ? await startLocalS3({ dir: mkdtempSync(path.join(tmpdir(), 'wyeward-load-s3-')), bucket: 'wyeward-load' }) : null;
const bucketEnv: Record<string, string> = bucket
  ? { S3_URL: bucket.endpoint, S3_BUCKET: 'wyeward-load', AWS_ACCESS_KEY_ID: LOCAL_S3_CREDENTIALS.accessKeyId, AWS_SECRET_ACCESS_KEY: LOCAL_S3_CREDENTIALS.secretAccessKey }
  : {};
// One after the other: the first makes the database, migrates and seeds; the second joins it.
const servers: BenchServer[] = [await startServer(bucketEnv)];
if (INSTANCES > 1) servers.push(await startServer({ ...bucketEnv, DATABASE_URL: servers[0].databaseUrl!, APP_URL: servers[0].url }));
const server = servers[0];
const bases = servers.map((s) => new URL(s.url));
if (!bases.every((b) => ['127.0.0.1', 'localhost', '::1'].includes(b.hostname))) throw new Error('the load test runs on loopback only');
const agents = servers.map(() => new Agent({ keepAlive: true, maxSockets: Math.ceil(CONNECTIONS / servers.length) }));
let turn = 0;

function send(method: string, path: string, headers: Record<string, string>, body?: string): Promise<{ status: number; text: string }> {
  const k = turn++ % servers.length;
  const base = bases[k];
  return new Promise((resolve, reject) => {
    const req = request({ host: base.hostname, port: base.port, method, path, headers: body ? { ...headers, 'Content-Length': Buffer.byteLength(body) } : headers, agent: agents[k] }, (res) => {
      let text = '';
      res.setEncoding('utf8');
      res.on('data', (c: string) => (text += c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, text }));
    });
    // Whether the request went out on a kept-alive connection used before (a failure there can be the
    // keep-alive race: the server closing an idle connection as the request reaches it).
    req.on('error', (e: Error & { reused?: boolean }) => reject(Object.assign(e, { reused: req.reusedSocket })));
    if (body) req.write(body);
    req.end();
  });
}

try {
  await new Promise((r) => setTimeout(r, 3000));
  const rssIdle = servers.map((s) => rssMb(s.pid));
  const users = await Promise.all(['owner', 'engineer', 'reviewer', 'viewer'].map((r) => session(server.url, `${r}@wyeward.test`)));
  const engineer = users[1];
  const list = JSON.parse((await send('GET', '/api/studies?pageSize=20', engineer)).text) as { items: { id: string }[] };
  const ids = list.items.map((s) => s.id);
  // A study of our own for the edits, so the demo studies keep their state.
  const created = JSON.parse((await send('POST', '/api/studies', engineer, JSON.stringify({ name: 'Load test study' }))).text) as { id: string };
  let version = 1;
  let n = 0;
  const pick = <T>(xs: T[]) => xs[n % xs.length];

  async function one(): Promise<number> {
    n++;
    const who = pick(users);
    const r = (n * 7919) % 100;
    if (r < 40) return (await send('GET', `/api/studies?pageSize=20&page=1`, who)).status;
    if (r < 60) return (await send('GET', `/api/studies/${pick(ids)}`, who)).status;
    if (r < 70) return (await send('GET', '/api/team', who)).status;
    if (r < 80) return (await send('GET', '/api/notifications', who)).status;
    if (r < 90) return (await send('GET', '/api/auth/me', who)).status;
    if (r < 95) return (await send('GET', `/api/studies/${pick(ids)}/revisions`, who)).status;
    const res = await send('PATCH', `/api/studies/${created.id}`, engineer, JSON.stringify({ version, name: `Load test study ${n}` }));
    if (res.status === 200) version = (JSON.parse(res.text) as { version: number }).version;
    return res.status === 409 ? 200 : res.status; // a lost race with our own previous edit is not a server error
  }

  // Warm up.
  for (let i = 0; i < 50; i++) await one();
  const rssBefore = servers.map((s) => rssMb(s.pid));
  const appCpu = () => servers.reduce((sum, s) => sum + cpuMs(s.pid), 0);
  const cpuBefore = appCpu();
  const threadsBefore = threadCpuMs(server.pid);
  const dbCpuBefore = server.postmasterPid ? clusterCpuMs(server.postmasterPid) : 0;
  const latencies: number[] = [];
  let errors = 0;
  const statuses = new Map<number, number>();
  /** Requests that got no HTTP answer, by the client's error code (ECONNRESET, EPIPE…), whether the connection was a reused one, and when. */
  const failures = new Map<string, number>();
  const inFlight: Promise<void>[] = [];
  const start = performance.now();
  const total = RATE * SECONDS;
  // Long runs: the server's RSS once a minute (the issue's target is for a 10-minute run).
  const rssTimer =
    SECONDS >= 120
      ? setInterval(() => {
          console.log(`  ${((performance.now() - start) / 60_000).toFixed(0)} min: RSS ${servers.map((s) => rssMb(s.pid).toFixed(0)).join(' + ')} MB, ${latencies.length} answered, ${errors} errors; ${machineLoad()}`);
        }, 60_000)
      : undefined;
  for (let i = 0; i < total; i++) {
    const due = start + (i * 1000) / RATE;
    const wait = due - performance.now();
    if (wait > 1) await new Promise((r) => setTimeout(r, wait));
    const t = performance.now();
    inFlight.push(
      one()
        .then((status) => {
          latencies.push(performance.now() - due); // from when it was due: includes waiting in our own queue
          statuses.set(status, (statuses.get(status) ?? 0) + 1);
          if (status >= 400) errors++;
        })
        .catch((e: unknown) => {
          errors++;
          const code = `${String((e as { code?: unknown }).code ?? (e as Error).message ?? e)} (${(e as { reused?: boolean }).reused ? 'reused connection' : 'new connection'}, after ${(performance.now() - t).toFixed(0)} ms)`;
          failures.set(code, (failures.get(code) ?? 0) + 1);
          latencies.push(performance.now() - t);
        }),
    );
  }
  await Promise.all(inFlight);
  clearInterval(rssTimer);
  const elapsed = (performance.now() - start) / 1000;
  const cpu = appCpu() - cpuBefore;
  const threadsAfter = threadCpuMs(server.pid);
  const dbCpu = server.postmasterPid ? clusterCpuMs(server.postmasterPid) - dbCpuBefore : 0;
  const rssAfter = servers.map((s) => rssMb(s.pid));
  const mb = (xs: number[]) => xs.map((x) => x.toFixed(0)).join(' + ');
  console.log(`mixed workload, ${RATE} req/s offered for ${SECONDS} s over ${CONNECTIONS} keep-alive connections (4 demo users); database: ${server.database}${servers.length > 1 ? `; ${servers.length} instances on it with one shared bucket` : ''}`);
  console.log(`achieved ${(total / elapsed).toFixed(1)} req/s; latency p50 ${percentile(latencies, 50).toFixed(1)} ms, p99 ${percentile(latencies, 99).toFixed(1)} ms; errors ${errors} (answers by status ${JSON.stringify([...statuses])}${failures.size ? `; no answer: ${JSON.stringify([...failures])}` : ''})`);
  console.log(`server CPU ${(cpu / total).toFixed(2)} ms per request (${(cpu / 1000).toFixed(1)} s over ${total} requests${servers.length > 1 ? ', all instances' : ''}); RSS ${mb(rssIdle)} MB idle after start, ${mb(rssBefore)} MB after warm-up → ${mb(rssAfter)} MB after the run`);
  console.log(`  by thread${servers.length > 1 ? ' (first instance)' : ''}, ms per request: ${threadSplit(server.pid, threadsBefore, threadsAfter, total / servers.length)}`);
  if (server.postmasterPid) console.log(`database server CPU ${(dbCpu / total).toFixed(2)} ms per request (${(dbCpu / 1000).toFixed(1)} s)`);
  console.log(machineLoad());
} finally {
  for (const a of agents) a.destroy();
  // The second instance first: the first one's stop also stops the database cluster.
  for (const s of servers.toReversed()) await s.stop();
  await bucket?.close();
}
