/**
 * Fast start for the CLIs: `launch('solve')` (server/cli/solve-launcher.mjs, `npm run solve`) runs
 * server/cli/solve.ts, `launch('sweep')` (sweep-launcher.mjs) server/cli/sweep.ts, `launch('balance')`
 * (balance-launcher.mjs) server/cli/balance.ts, each from its own
 * prebuilt single-file CommonJS bundle, rebuilt on demand with
 * esbuild (vite's own dependency) when any of its sources changed — like server/client-build.ts does
 * for the client — and loaded with V8's code cache (see loadBundle).
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
import { mkdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import vm from 'node:vm';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const cacheDir = process.env.WYEWARD_CLI_CACHE ? path.resolve(process.env.WYEWARD_CLI_CACHE) : path.join(root, 'node_modules/.cache/wyeward-cli');
/** Paths of one CLI: its TypeScript entry and its bundle, code cache and build metadata. */
const pathsOf = (name) => ({
  entry: path.join(root, `server/cli/${name}.ts`),
  bundlePath: path.join(cacheDir, `${name}.cjs`),
  codeCachePath: path.join(cacheDir, `${name}.cjs.v8cache`),
  metaPath: path.join(cacheDir, `${name}.meta.json`),
});
/** Changing the build options below must change this key (it invalidates older bundles). */
const OPTIONS_KEY = 'cjs-node20-bundle-codecache-v2';
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
function isFresh({ bundlePath, metaPath }) {
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
async function build({ entry, bundlePath, codeCachePath, metaPath }) {
  let esbuild;
  try {
    esbuild = await import('esbuild');
  } catch {
    return false;
  }
  const started = Date.now(); // taken before the build: a file saved during it triggers the next one
  const tmp = path.join(cacheDir, `${path.basename(bundlePath, '.cjs')}.${process.pid}.${started}.tmp.cjs`);
  try {
    mkdirSync(cacheDir, { recursive: true });
    const result = await esbuild.build({
      absWorkingDir: root,
      entryPoints: [entry],
      bundle: true,
      platform: 'node',
      format: 'cjs',
      target: 'node20',
      outfile: tmp,
      metafile: true,
      logLevel: 'silent',
      legalComments: 'none',
    });
    const inputs = Object.keys(result.metafile.inputs).filter((p) => !p.startsWith('node_modules/') && !p.includes('/node_modules/'));
    renameSync(tmp, bundlePath);
    rmSync(codeCachePath, { force: true });
    const metaTmp = `${metaPath}.${process.pid}.tmp`;
    writeFileSync(metaTmp, JSON.stringify({ key: OPTIONS_KEY, builtFrom: started - 1, inputs }));
    renameSync(metaTmp, metaPath);
    return true;
  } catch {
    return false;
  }
}

/**
 * Run the CommonJS bundle through vm.Script with V8's code cache: the first run after a build
 * compiles it and, once the CLI has run, stores the compiled code (functions compiled during the
 * run included); later runs skip parsing and compiling ~1 MB of JavaScript. V8 rejects a cache
 * that does not match the source or the V8 version, and a new one is written.
 */
function loadBundle({ entry, bundlePath, codeCachePath }) {
  const code = readFileSync(bundlePath, 'utf8');
  let cachedData;
  try {
    cachedData = readFileSync(codeCachePath);
  } catch {
    cachedData = undefined;
  }
  const script = new vm.Script(`(function (exports, require, module, __filename, __dirname) {${code}\n})`, { filename: bundlePath, cachedData });
  const mod = { exports: {} };
  // `require` resolves from the CLI's source file, so packages loaded at run time (HiGHS for
  // balance) are found in the project's node_modules wherever the cache folder is
  script.runInThisContext().call(mod.exports, mod.exports, createRequire(entry), mod, bundlePath, path.dirname(bundlePath));
  const storeCache = () => {
    if (cachedData !== undefined && !script.cachedDataRejected) return;
    try {
      const tmp = `${codeCachePath}.${process.pid}.tmp`;
      writeFileSync(tmp, script.createCachedData());
      renameSync(tmp, codeCachePath);
    } catch {
      // a cache that cannot be written only costs speed
    }
  };
  return { cli: mod.exports, storeCache };
}

async function loadCli(paths) {
  if (process.env.WYEWARD_CLI_NO_BUNDLE !== '1' && (isFresh(paths) || (await build(paths)))) return loadBundle(paths);
  const { register } = await import('tsx/esm/api');
  register();
  return { cli: await import(pathToFileURL(paths.entry).href), storeCache: () => {} };
}

/** Run the CLI `name` (server/cli/<name>.ts, which exports main(argv)) on this process's arguments. */
export async function launch(name) {
  const { cli, storeCache } = await loadCli(pathsOf(name));
  cli.main(process.argv.slice(2));
  storeCache();
}
