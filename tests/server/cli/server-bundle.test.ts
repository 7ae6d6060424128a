/**
 * `npm start`'s server bundle (server/start.mjs): built into the cache folder with the sources it
 * was made from, reused while fresh, rebuilt when a source is newer than the build; each source
 * keeps its own import.meta paths and packages are imported by their resolved file URLs, so the
 * bundle runs from any folder (here a temporary one outside the project).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const root = path.resolve(import.meta.dirname, '../../..');
const cache = path.join(mkdtempSync(path.join(tmpdir(), 'wyeward-server-bundle-')), 'cache');
const bundle = path.join(cache, 'server.mjs');
const meta = path.join(cache, 'server.meta.json');

/** Makes the bundle (or keeps a fresh one) in a child process, as `npm start` would before running it. */
function ensureBundle() {
  const r = spawnSync(process.execPath, ['--input-type=module', '-e', "const { serverBundle } = await import('./server/start.mjs'); console.log(await serverBundle());"], {
    cwd: root,
    encoding: 'utf8',
    env: { ...process.env, WYEWARD_CLI_CACHE: cache },
  });
  return { code: r.status, stdout: r.stdout.trim(), stderr: r.stderr };
}

describe('server bundle', () => {
  it('is built from the server sources, with each source’s own paths and packages by their file URLs', () => {
    const first = ensureBundle();
    expect(first.stderr).toBe('');
    expect(first.stdout).toBe(bundle);
    const m = JSON.parse(readFileSync(meta, 'utf8'));
    expect(m.key).toContain(root);
    expect(m.inputs).toEqual(expect.arrayContaining(['server/index.ts', 'server/app.ts', 'server/db/index.ts', 'shared/engine/index.ts']));
    expect(m.inputs.some((p: string) => p.includes('node_modules'))).toBe(false);
    const code = readFileSync(bundle, 'utf8');
    // the migrations folder is found from db/index.ts's own folder, the database thread beside pglite-client.ts
    expect(code).toContain(JSON.stringify(path.join(root, 'server', 'db')));
    expect(code).not.toMatch(/import\.meta\.(url|dirname)/);
    expect(code).toMatch(/from "file:\/\/[^"]*\/node_modules\/express\//);
  });

  it('is reused while fresh and rebuilt when a source is newer than the build', () => {
    ensureBundle();
    const builtAt = statSync(bundle).mtimeMs;
    expect(ensureBundle().code).toBe(0);
    expect(statSync(bundle).mtimeMs).toBe(builtAt); // fresh: not rebuilt
    // pretend the build predates the sources (as when one is saved after it): the next start rebuilds
    const m = JSON.parse(readFileSync(meta, 'utf8'));
    writeFileSync(meta, JSON.stringify({ ...m, builtFrom: statSync(path.join(root, 'server/health.ts')).mtimeMs - 1 }));
    expect(ensureBundle().code).toBe(0);
    expect(statSync(bundle).mtimeMs).not.toBe(builtAt);
    expect(JSON.parse(readFileSync(meta, 'utf8')).builtFrom).toBeGreaterThan(m.builtFrom - 1);
  });

  it('is not reused by another checkout (the key names the project folder)', () => {
    ensureBundle();
    const m = JSON.parse(readFileSync(meta, 'utf8'));
    writeFileSync(meta, JSON.stringify({ ...m, key: m.key.replace(root, '/elsewhere') }));
    const builtAt = statSync(bundle).mtimeMs;
    expect(ensureBundle().code).toBe(0);
    expect(statSync(bundle).mtimeMs).not.toBe(builtAt);
    expect(JSON.parse(readFileSync(meta, 'utf8')).key).toContain(root);
  });
});
