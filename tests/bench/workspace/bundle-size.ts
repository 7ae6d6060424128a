/**
 * Benchmark (prints figures): the JavaScript a browser loads for the studies list, gzipped, with
 * the workspace on demand. Builds the client into a temporary directory with a manifest (the
 * project's own dist/ is left alone), then sums the entry chunk and its static imports, and lists
 * each lazy route chunk and the solve worker. Run: `node --import tsx tests/bench/workspace/bundle-size.ts`.
 * Issue target: initial JavaScript of the studies list under 250 kB gzipped.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { gzipSync } from 'node:zlib';

interface ManifestChunk {
  file: string;
  src?: string;
  isEntry?: boolean;
  isDynamicEntry?: boolean;
  imports?: string[];
  dynamicImports?: string[];
}

const root = path.resolve(import.meta.dirname, '../../..');
const out = mkdtempSync(path.join(tmpdir(), 'wyeward-bundle-'));
try {
  const build = spawnSync(process.execPath, [path.join(root, 'node_modules/vite/bin/vite.js'), 'build', '--outDir', out, '--emptyOutDir', '--manifest', '--logLevel', 'warn'], { cwd: root, encoding: 'utf8' });
  if (build.status !== 0) throw new Error(`vite build failed:\n${build.stderr}`);
  const manifest = JSON.parse(readFileSync(path.join(out, '.vite/manifest.json'), 'utf8')) as Record<string, ManifestChunk>;
  const size = (file: string) => {
    const buf = readFileSync(path.join(out, file));
    return { raw: buf.length, gz: gzipSync(buf, { level: 9 }).length };
  };
  const kB = (n: number) => `${(n / 1000).toFixed(1)} kB`;
  /** A chunk and everything it imports statically (what loads before it runs). */
  const closure = (key: string, seen = new Set<string>()): Set<string> => {
    if (seen.has(key)) return seen;
    seen.add(key);
    for (const k of manifest[key].imports ?? []) closure(k, seen);
    return seen;
  };
  const entry = Object.keys(manifest).find((k) => manifest[k].isEntry)!;
  const initial = [...closure(entry)].map((k) => manifest[k].file).filter((f) => f.endsWith('.js'));
  const initialGz = initial.reduce((s, f) => s + size(f).gz, 0);
  const initialRaw = initial.reduce((s, f) => s + size(f).raw, 0);
  console.log(`initial JavaScript (entry ${manifest[entry].file} + static imports, ${initial.length} file(s)): ${kB(initialRaw)} raw, ${kB(initialGz)} gzip → target < 250 kB gzip ${initialGz < 250_000 ? 'met' : 'NOT met'}`);
  console.log('on demand:');
  for (const [key, c] of Object.entries(manifest)) {
    if (!c.isDynamicEntry) continue;
    const own = [...closure(key)].filter((k) => !closure(entry).has(k)).map((k) => manifest[k].file);
    const gz = own.reduce((s, f) => s + size(f).gz, 0);
    console.log(`  ${c.src ?? key}: ${kB(gz)} gzip (${own.join(', ')})`);
  }
  for (const f of readdirSync(path.join(out, 'assets')).filter((x) => /worker.*\.js$/.test(x))) {
    const s = size(`assets/${f}`);
    console.log(`  worker ${f}: ${kB(s.raw)} raw, ${kB(s.gz)} gzip (fetched when the workspace starts its first solve)`);
  }
} finally {
  rmSync(out, { recursive: true, force: true });
}
