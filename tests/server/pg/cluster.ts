/**
 * A throwaway PostgreSQL cluster for tests and benchmarks: initdb in a temporary directory, started
 * with pg_ctl on a free loopback port, stopped and removed by `stop()`. Uses the Debian package's
 * binaries (/usr/lib/postgresql/<version>/bin; tests/run.ts and .ci/run install `postgresql` when
 * missing). PostgreSQL refuses to run as root, so as root it runs as the `postgres` system user the
 * package creates (or a `wyeward-pg` user made here when there is none).
 */
import { execFileSync, spawn, spawnSync } from 'node:child_process';
import { chownSync, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import pg from 'pg';

export interface Cluster {
  /** Connection string of the `postgres` database as the superuser `postgres` (trust auth on loopback). */
  url: string;
  /** The same server, another database. */
  urlOf(database: string): string;
  port: number;
  /** Major version of the server (the Debian package's directory name). */
  version: string;
  /** Process id of the postmaster. */
  pid: number;
  /** Stops the server and removes its files. */
  stop(): void;
}

/** The newest installed PostgreSQL's bin directory, or null. */
export function postgresBinDir(): string | null {
  const base = '/usr/lib/postgresql';
  if (!existsSync(base)) return null;
  const versions = readdirSync(base)
    .filter((v) => existsSync(path.join(base, v, 'bin', 'initdb')) && existsSync(path.join(base, v, 'bin', 'pg_ctl')))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length > 0 ? path.join(base, versions[0], 'bin') : null;
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const a = s.address();
      const port = typeof a === 'object' && a ? a.port : 0;
      s.close(() => resolve(port));
    });
  });
}

interface RunAs {
  uid: number;
  gid: number;
  name: string;
}

/** The unprivileged user to run PostgreSQL as when we are root (null when we are not root). */
function serverUser(): RunAs | null {
  if (typeof process.getuid !== 'function' || process.getuid() !== 0) return null;
  const find = (name: string): RunAs | null => {
    const line = readFileSync('/etc/passwd', 'utf8')
      .split('\n')
      .find((l) => l.startsWith(`${name}:`));
    if (!line) return null;
    const f = line.split(':');
    return { name, uid: Number(f[2]), gid: Number(f[3]) };
  };
  const existing = find('postgres') ?? find('wyeward-pg');
  if (existing) return existing;
  execFileSync('useradd', ['--system', '--no-create-home', '--shell', '/usr/sbin/nologin', 'wyeward-pg']);
  return find('wyeward-pg');
}

function run(user: RunAs | null, bin: string, args: string[]): void {
  const [cmd, argv] = user ? ['runuser', ['-u', user.name, '--', bin, ...args]] : [bin, args];
  const r = spawnSync(cmd, argv, { encoding: 'utf8', cwd: '/' });
  if (r.status !== 0) throw new Error(`${path.basename(bin)} failed (${r.status ?? r.signal}): ${r.stderr || r.stdout || r.error?.message}`);
}

/**
 * A detached shell that stops the cluster and removes its directory if this process dies without
 * doing so (killed by a timeout or a signal: vitest's teardown never runs then).
 */
function watchdog(owner: number, user: RunAs | null, bin: string, data: string, dir: string): void {
  const pgCtl = `${user ? `runuser -u ${user.name} -- ` : ''}'${path.join(bin, 'pg_ctl')}' -D '${data}' -m immediate stop`;
  const script = `while kill -0 ${owner} 2>/dev/null && [ -d '${dir}' ]; do sleep 2; done; if [ -d '${data}' ]; then ${pgCtl} >/dev/null 2>&1; rm -rf '${dir}'; fi`;
  spawn('sh', ['-c', script], { detached: true, stdio: 'ignore', cwd: '/' }).unref();
}

/** Starts a fresh cluster tuned for throwaway use (no fsync: a crash loses it, which is fine for tests). */
export async function startCluster({ maxConnections = 300 }: { maxConnections?: number } = {}): Promise<Cluster> {
  const bin = postgresBinDir();
  if (!bin) {
    throw new Error(
      'PostgreSQL is not installed (no /usr/lib/postgresql/*/bin/initdb). The server-pg tests need it: apt-get install -y postgresql (npm test and .ci/run do this when run as root).',
    );
  }
  const user = serverUser();
  const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-pgcluster-'));
  if (user) chownSync(dir, user.uid, user.gid);
  const data = path.join(dir, 'data');
  const port = await freePort();
  let started = false;
  const stop = () => {
    if (started) {
      started = false;
      try {
        run(user, path.join(bin, 'pg_ctl'), ['-D', data, '-m', 'immediate', '-w', 'stop']);
      } catch {
        // Already gone: removing its files is all that is left.
      }
    }
    rmSync(dir, { recursive: true, force: true });
  };
  try {
    run(user, path.join(bin, 'initdb'), ['-D', data, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--no-locale', '--no-sync']);
    const options = [
      `-p ${port}`,
      `-k ${dir}`,
      '-c listen_addresses=127.0.0.1',
      `-c max_connections=${maxConnections}`,
      '-c fsync=off',
      '-c synchronous_commit=off',
      '-c full_page_writes=off',
      '-c shared_buffers=64MB',
    ].join(' ');
    run(user, path.join(bin, 'pg_ctl'), ['-D', data, '-l', path.join(dir, 'server.log'), '-w', '-t', '60', '-o', options, 'start']);
    started = true;
    watchdog(process.pid, user, bin, data, dir);
  } catch (err) {
    stop();
    throw err;
  }
  const urlOf = (database: string) => `postgres://postgres@127.0.0.1:${port}/${database}`;
  const pid = Number(readFileSync(path.join(data, 'postmaster.pid'), 'utf8').split('\n')[0]);
  return { url: urlOf('postgres'), urlOf, port, version: path.basename(path.dirname(bin)), pid, stop };
}

/** Runs statements on the cluster's `postgres` database with a short-lived connection (CREATE DATABASE cannot run in a pool's transaction). */
export async function adminQuery(url: string, ...statements: string[]): Promise<void> {
  const client = new pg.Client({ connectionString: url });
  await client.connect();
  try {
    for (const s of statements) await client.query(s);
  } finally {
    await client.end();
  }
}
