/**
 * `npm start` builds the client only when needed: when dist/ is missing or any client source is
 * newer than the stamp written after the last build. The build runs in-process with vite's JS API.
 */
import { existsSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';

/** What the client build depends on, relative to the project root. */
export const CLIENT_SOURCES = ['src', 'shared', 'public', 'index.html', 'vite.config.ts', 'package.json'];
export const STAMP_FILE = '.wyeward-build-stamp';

/** Newest modification time (ms since epoch) of any file under `paths` (skipping missing ones). */
export function newestMtimeMs(root: string, paths: string[] = CLIENT_SOURCES): number {
  let newest = 0;
  const visit = (p: string) => {
    let st;
    try {
      st = statSync(p);
    } catch {
      return;
    }
    if (st.isDirectory()) {
      for (const name of readdirSync(p)) {
        if (name === 'node_modules' || name.startsWith('.')) continue;
        visit(path.join(p, name));
      }
    } else {
      newest = Math.max(newest, st.mtimeMs);
    }
  };
  for (const rel of paths) visit(path.join(root, rel));
  return newest;
}

/** Why the build must run, or null when dist/ is up to date. */
export function staleReason(root: string): string | null {
  const dist = path.join(root, 'dist');
  if (!existsSync(path.join(dist, 'index.html'))) return 'no client build in dist/';
  const stampPath = path.join(dist, STAMP_FILE);
  if (!existsSync(stampPath)) return 'dist/ has no build stamp';
  const built = Number(readFileSync(stampPath, 'utf8').trim());
  const newest = newestMtimeMs(root);
  return Number.isFinite(built) && built >= newest ? null : 'client sources changed since the last build';
}

/** Builds the client into dist/ when it is missing or stale; returns what happened. */
export async function ensureClientBuild(root: string, log: (msg: string) => void = console.log): Promise<'fresh' | 'built'> {
  const reason = staleReason(root);
  if (!reason) return 'fresh';
  log(`Building the client (${reason})…`);
  const sourcesAt = newestMtimeMs(root); // taken before the build: a file saved during it triggers the next one
  const started = Date.now();
  const { build } = await import('vite');
  await build({ root, configFile: path.join(root, 'vite.config.ts'), logLevel: 'warn' });
  writeFileSync(path.join(root, 'dist', STAMP_FILE), String(sourcesAt));
  log(`Client built in ${((Date.now() - started) / 1000).toFixed(1)} s.`);
  return 'built';
}
