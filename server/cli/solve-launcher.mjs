/**
 * Fast start for the solve CLI: `node server/cli/solve-launcher.mjs <file.json> [--json [--full]]`
 * runs server/cli/solve.ts from a prebuilt single-file bundle, rebuilt on demand with esbuild (vite's
 * own dependency) when any of its sources changed — like server/client-build.ts does for the client.
 *
 * Why: measured on this machine, `node --import tsx server/cli/solve.ts` spent ~1.7 s before reading
 * the file (tsx's loader transforming and resolving ~60 modules), against ~0.3 s for the bundle;
 * that start-up dominated the CLI at every size below 5 000 buses. Plain JavaScript on purpose: the
 * launcher itself must start without a TypeScript loader.
 *
 * Freshness: the bundle's metafile lists every source it was built from; the bundle is fresh when
 * none of them (nor package-lock.json) is newer than the build, and the build options are the same.
 * Builds write to a temporary name and rename, so concurrent runs never see half a file. If the
 * build cannot run (esbuild missing, a syntax error), the launcher falls back to tsx, which then
 * reports the real problem. WYEWARD_CLI_CACHE overrides the cache folder (default
 * node_modules/.cache/wyeward-cli); WYEWARD_CLI_NO_BUNDLE=1 forces the tsx path.
 */
import { mkdirSync, readFileSync, renameSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const entry = path.join(root, 'server/cli/solve.ts');
const cacheDir = process.env.WYEWARD_CLI_CACHE ? path.resolve(process.env.WYEWARD_CLI_CACHE) : path.join(root, 'node_modules/.cache/wyeward-cli');
const bundlePath = path.join(cacheDir, 'solve.mjs');
const metaPath = path.join(cacheDir, 'solve.meta.json');
/** Changing the build options below must change this key (it invalidates older bundles). */
const OPTIONS_KEY = 'esm-node20-bundle-v1';
/** Files outside the import graph that still change what the bundle contains. */
const EXTRA_INPUTS = ['package-lock.json'];

const mtime = (p) => {
  try {
    return statSync(p).mtimeMs;
  } catch {
    return Infinity; // missing: stale
  }
};

/** True when the bundle exists and none of its sources is newer than its build. */
function isFresh() {
  let meta;
  try {
    meta = JSON.parse(readFileSync(metaPath, 'utf8'));
  } catch {
    return false;
  }
  if (meta.key !== OPTIONS_KEY || !Array.isArray(meta.inputs) || !(meta.builtFrom >= 0)) return false;
  if (mtime(bundlePath) === Infinity) return false;
  for (const rel of [...meta.inputs, ...EXTRA_INPUTS]) if (mtime(path.join(root, rel)) > meta.builtFrom) return false;
  return true;
}

/** Build the bundle with esbuild's JS API; returns false when it cannot. */
async function build() {
  let esbuild;
  try {
    esbuild = await import('esbuild');
  } catch {
    return false;
  }
  const started = Date.now(); // taken before the build: a file saved during it triggers the next one
  const tmp = path.join(cacheDir, `solve.${process.pid}.${started}.tmp.mjs`);
  try {
    mkdirSync(cacheDir, { recursive: true });
    const result = await esbuild.build({
      absWorkingDir: root,
      entryPoints: [entry],
      bundle: true,
      platform: 'node',
      format: 'esm',
      target: 'node20',
      outfile: tmp,
      metafile: true,
      logLevel: 'silent',
      legalComments: 'none',
    });
    const inputs = Object.keys(result.metafile.inputs).filter((p) => !p.startsWith('node_modules/') && !p.includes('/node_modules/'));
    renameSync(tmp, bundlePath);
    const metaTmp = `${metaPath}.${process.pid}.tmp`;
    writeFileSync(metaTmp, JSON.stringify({ key: OPTIONS_KEY, builtFrom: started - 1, inputs }));
    renameSync(metaTmp, metaPath);
    return true;
  } catch {
    return false;
  }
}

async function loadCli() {
  if (process.env.WYEWARD_CLI_NO_BUNDLE !== '1' && (isFresh() || (await build()))) return import(pathToFileURL(bundlePath).href);
  const { register } = await import('tsx/esm/api');
  register();
  return import(pathToFileURL(entry).href);
}

const cli = await loadCli();
cli.main(process.argv.slice(2));
