/**
 * Starts the real server (`server/index.ts`) on a free loopback port with a fresh data directory, for
 * the server benchmarks. With BENCH_DATABASE=postgres it runs on a throwaway PostgreSQL cluster
 * (tests/server/pg/cluster.ts) through DATABASE_URL instead of the embedded database.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, openSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { loadavg, tmpdir } from 'node:os';
import path from 'node:path';
import { ensureClientBuild } from '../../../server/client-build.ts';
// @ts-expect-error plain JavaScript without declarations
import { serverBundle } from '../../../server/start.mjs';
import { adminQuery, startCluster, type Cluster } from '../../server/pg/cluster.ts';

export const ROOT = path.resolve(import.meta.dirname, '../../..');

export interface BenchServer {
  url: string;
  pid: number;
  /** Which database the server runs on (for the printed figures). */
  database: string;
  /** The PostgreSQL cluster's postmaster when BENCH_DATABASE=postgres (its backends' CPU is the database's). */
  postmasterPid?: number;
  /** DATABASE_URL of that cluster's database (another instance may be started on it). */
  databaseUrl?: string;
  child: ChildProcess;
  stop(): Promise<void>;
}

async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = createServer();
    s.listen(0, '127.0.0.1', () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
}

/**
 * Starts the server; `dataDir` (kept on stop) instead of a fresh directory removed on stop. The
 * client is built first when stale, and the server's bundle made (here, not in the measured
 * server: npm start would otherwise build the client in its own process, which then holds several
 * hundred MB more, and a build is not part of any figure).
 */
export async function startServer(env: Record<string, string> = {}, { dataDir: keptDir }: { dataDir?: string } = {}): Promise<BenchServer> {
  await ensureClientBuild(ROOT);
  if (process.env.BENCH_SERVER_TSX !== '1' && !(await serverBundle())) throw new Error('the server bundle could not be built (run `npm start` to see why)');
  const port = await freePort();
  const dataDir = keptDir ?? mkdtempSync(path.join(tmpdir(), 'wyeward-bench-'));
  const url = `http://127.0.0.1:${port}`;
  let cluster: Cluster | undefined;
  const dbEnv: Record<string, string> = {};
  if (process.env.BENCH_DATABASE === 'postgres' && !env.DATABASE_URL) {
    cluster = await startCluster();
    await adminQuery(cluster.url, 'create database wyeward_bench');
    dbEnv.DATABASE_URL = cluster.urlOf('wyeward_bench');
  }
  // BENCH_NODE_ARGS: more options for the server's node (e.g. `--cpu-prof --cpu-prof-dir=/tmp/prof`: a V8
  // CPU profile per thread when it stops; `--trace-gc`); BENCH_SERVER_LOG=<file>: its standard output there.
  const nodeArgs = (process.env.BENCH_NODE_ARGS ?? '').split(' ').filter(Boolean);
  const log = process.env.BENCH_SERVER_LOG ? openSync(process.env.BENCH_SERVER_LOG, 'a') : 'ignore';
  // What `npm start` runs (server/start.mjs: the server's cached bundle); BENCH_SERVER_TSX=1 runs
  // server/index.ts through tsx instead (the way npm start ran before the bundle), for comparisons.
  const entry = process.env.BENCH_SERVER_TSX === '1' ? ['--import', 'tsx', 'server/index.ts'] : ['server/start.mjs'];
  const child = spawn(process.execPath, [...nodeArgs, ...entry], {
    cwd: ROOT,
    env: { ...process.env, PORT: String(port), DATA_DIR: dataDir, DEMO: '1', APP_URL: url, SIGN_UP_ADDRESS_LIMIT: '100000', ...dbEnv, ...env },
    stdio: ['ignore', log, 'inherit'],
  });
  // A server that goes away during a benchmark is said at once (its exit code or the signal that
  // stopped it), so a failed request is not mistaken for one the server refused.
  let stopping = false;
  child.once('exit', (code, signal) => {
    if (!stopping) console.error(`benchmark server (pid ${child.pid}) exited unexpectedly: ${signal ? `signal ${signal}` : `exit code ${code}`}`);
  });
  for (let i = 0; i < 600; i++) {
    try {
      if ((await fetch(`${url}/api/health`)).ok) break;
    } catch {
      // not up yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  return {
    url,
    pid: child.pid!,
    database: cluster ? `PostgreSQL ${cluster.version} (throwaway cluster on loopback, fsync off), DATABASE_POOL_MAX ${env.DATABASE_POOL_MAX ?? process.env.DATABASE_POOL_MAX ?? 10}` : 'embedded PGlite',
    postmasterPid: cluster?.pid,
    databaseUrl: dbEnv.DATABASE_URL,
    child,
    async stop() {
      stopping = true;
      if (child.exitCode === null && child.signalCode === null) {
        child.kill('SIGTERM');
        await new Promise((r) => child.once('exit', r));
      }
      cluster?.stop();
      if (!keptDir) rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

/** Signs in and returns the headers a browser on the app would send (cookie, Origin). */
export async function session(url: string, email = 'engineer@wyeward.test', password = 'wyeward-demo'): Promise<Record<string, string>> {
  const res = await fetch(`${url}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', Origin: url },
    body: JSON.stringify({ email, password }),
  });
  if (!res.ok) throw new Error(`sign-in failed: ${res.status}`);
  const cookie = res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  return { Cookie: cookie, Origin: url, 'Content-Type': 'application/json' };
}

/** The p-th percentile (0–100) of `xs`. */
export function percentile(xs: number[], p: number): number {
  if (xs.length === 0) return NaN;
  const s = xs.slice().sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.ceil((p / 100) * s.length) - 1)];
}

/** RSS of a process in MB, from /proc. */
export function rssMb(pid: number): number {
  try {
    const m = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
    return m ? Number(m[1]) / 1024 : NaN;
  } catch {
    return NaN;
  }
}

/** CPU time (user + system) of a process in ms, from /proc (clock ticks of 10 ms). */
export function cpuMs(pid: number): number {
  const f = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
  return (Number(f[11]) + Number(f[12])) * 10;
}

/** The machine's load line (the figures depend on it). */
export function machineLoad(): string {
  return `load average ${loadavg().map((x) => x.toFixed(2)).join(' ')}`;
}

/** CPU time in ms of a PostgreSQL postmaster and all its backends (their CPU is the database's share of the work). */
export function clusterCpuMs(postmasterPid: number): number {
  let total = cpuMs(postmasterPid);
  for (const entry of readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const f = readFileSync(`/proc/${entry}/stat`, 'utf8').split(') ')[1].split(' ');
      if (Number(f[1]) === postmasterPid) total += (Number(f[11]) + Number(f[12])) * 10;
    } catch {
      // gone meanwhile
    }
  }
  return total;
}

/**
 * CPU time in ms of each thread of a process, by thread id, from /proc/<pid>/task (the main thread's
 * id is the pid; the embedded database's thread is the other busy one). Thread names are the
 * kernel's (`comm`), e.g. "node", "V8 DefaultWorke", "libuv-worker".
 */
export function threadCpuMs(pid: number): Map<number, { name: string; ms: number }> {
  const out = new Map<number, { name: string; ms: number }>();
  let tids: string[] = [];
  try {
    tids = readdirSync(`/proc/${pid}/task`);
  } catch {
    return out;
  }
  for (const tid of tids) {
    try {
      const stat = readFileSync(`/proc/${pid}/task/${tid}/stat`, 'utf8');
      const name = stat.slice(stat.indexOf('(') + 1, stat.lastIndexOf(')'));
      const f = stat.slice(stat.lastIndexOf(') ') + 2).split(' ');
      out.set(Number(tid), { name, ms: (Number(f[11]) + Number(f[12])) * 10 });
    } catch {
      // gone meanwhile
    }
  }
  return out;
}

/**
 * The busiest threads between two `threadCpuMs` readings, as "main 3.1, thread 2.9, …" ms per request:
 * the main thread first, then the others by CPU (the embedded database's thread is normally second).
 */
export function threadSplit(pid: number, before: Map<number, { name: string; ms: number }>, after: Map<number, { name: string; ms: number }>, requests: number): string {
  const rows = [...after].map(([tid, a]) => ({ tid, name: a.name, ms: a.ms - (before.get(tid)?.ms ?? 0) })).filter((r) => r.ms > 0);
  const main = rows.find((r) => r.tid === pid);
  const others = rows.filter((r) => r.tid !== pid).sort((a, b) => b.ms - a.ms);
  const fmt = (r: { name: string; ms: number }, label: string) => `${label} ${(r.ms / requests).toFixed(2)}`;
  const rest = others.slice(3).reduce((s, r) => s + r.ms, 0);
  return [main ? fmt(main, 'main thread') : null, ...others.slice(0, 3).map((r) => fmt(r, `"${r.name}"`)), rest > 0 ? `others ${(rest / requests).toFixed(2)}` : null].filter(Boolean).join(', ');
}
