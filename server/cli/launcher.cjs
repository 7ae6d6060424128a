/**
 * Fast start for the CLIs: `launch('solve')` (server/cli/solve-launcher.cjs, which `npm run solve`
 * runs through solve.sh; solve-launcher.mjs for `node server/cli/solve-launcher.mjs`) runs
 * server/cli/solve.ts, `launch('sweep')` (sweep-launcher.mjs) server/cli/sweep.ts, `launch('balance')`
 * (balance-launcher.mjs) server/cli/balance.ts, each from its own
 * prebuilt single-file CommonJS bundle, rebuilt on demand with
 * esbuild (vite's own dependency) when any of its sources changed — like server/client-build.ts does
 * for the client — and loaded with V8's code cache (see loadBundle).
 *
 * Why: measured on this machine, `node --import tsx server/cli/solve.ts` spent ~1.7 s before reading
 * the file (tsx's loader transforming and resolving ~60 modules), against ~0.3 s for the bundle;
 * that start-up dominated the CLI at every size below 5 000 buses. Plain JavaScript on purpose: the
 * launcher itself must start without a TypeScript loader. CommonJS on purpose: an ES module as the
 * entry makes node set up its ES module loader first (measured: an empty .mjs file ~15 ms more CPU
 * than an empty .cjs one and ~130 more page faults, at load ~12), so the entries that matter for
 * speed (solve-launcher.cjs) are CommonJS; the .mjs launchers import this file.
 *
 * Freshness: the bundle's metafile lists every source it was built from; the bundle is fresh when
 * none of them (nor package-lock.json) is newer than the build, and the build options are the same.
 * Builds write to a temporary name and rename, so concurrent runs never see half a file. If the
 * build cannot run (esbuild missing, a syntax error), the launcher falls back to tsx, which then
 * reports the real problem. WYEWARD_CLI_CACHE overrides the cache folder (default
 * node_modules/.cache/wyeward-cli); WYEWARD_CLI_NO_BUNDLE=1 forces the tsx path.
 *
 * Lean start: a CLI may have a lean entry (LEAN below: `solve` → server/cli/solve-lean.ts, the typed
 * path of `--json` for primitive-only files, 62 KB: no zod, no general engine), bundled and
 * cached the same way and loaded first. Its main(argv) returns undefined when it did the whole run;
 * otherwise the full bundle runs with main(argv, handOver) (handOver: what the lean start already
 * did, e.g. the file's text). WYEWARD_CLI_NO_LEAN=1 skips the lean start.
 *
 * zod's locales: the bundles carry only the English messages zod uses by default (classic/schemas.js
 * imports locales/en.js itself); the `locales` namespace, which nothing here reads, is replaced by
 * one that holds `en` only (ZOD_LOCALES_EN), which takes ~0.36 MB out of ~1 MB.
 */
'use strict';
const { mkdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } = require('node:fs');
const { createRequire } = require('node:module');
const path = require('node:path');
const { pathToFileURL } = require('node:url');
const vm = require('node:vm');

const root = path.resolve(__dirname, '../..');
const cacheDir = process.env.WYEWARD_CLI_CACHE ? path.resolve(process.env.WYEWARD_CLI_CACHE) : path.join(root, 'node_modules/.cache/wyeward-cli');
/** Paths of one CLI: its TypeScript entry and its bundle, code cache and build metadata. */
const pathsOf = (name) => ({
  entry: path.join(root, `server/cli/${name}.ts`),
  bundlePath: path.join(cacheDir, `${name}.cjs`),
  codeCachePath: path.join(cacheDir, `${name}.cjs.v8cache`),
  metaPath: path.join(cacheDir, `${name}.meta.json`),
});
/** Changing the build options below must change this key (it invalidates older bundles). */
const OPTIONS_KEY = 'cjs-node20-bundle-codecache-v3-zod-en';
/** The lean entry loaded before a CLI's full bundle (see the module comment). */
const LEAN = { solve: 'solve-lean' };
/** Files outside the import graph that still change what the bundle contains. */
const EXTRA_INPUTS = ['package-lock.json'];

const mtime = (p) => {
  try {
    return statSync(p).mtimeMs;
  } catch {
    return Infinity; // missing: stale
  }
};

/**
 * True when the bundle exists and none of its sources is newer than its build. `key`: the build
 * options' key (server/start.mjs builds the server with its own).
 */
function isFresh({ bundlePath, metaPath }, key = OPTIONS_KEY) {
  let meta;
  try {
    meta = JSON.parse(readFileSync(metaPath, 'utf8'));
  } catch {
    return false;
  }
  if (meta.key !== key || !Array.isArray(meta.inputs) || !(meta.builtFrom >= 0)) return false;
  if (mtime(bundlePath) === Infinity) return false;
  for (const rel of [...meta.inputs, ...EXTRA_INPUTS]) if (mtime(path.join(root, rel)) > meta.builtFrom) return false;
  return true;
}

/** esbuild plugin: zod's locales/index.js (every language) → a module exporting `en` only. */
const ZOD_LOCALES_EN = {
  name: 'zod-locales-en',
  setup(b) {
    b.onResolve({ filter: /^\.\.\/locales\/index\.js$/ }, (args) => (/[\\/]zod[\\/]v4[\\/](classic|core)$/.test(args.resolveDir) ? { path: path.join(args.resolveDir, '../locales/en.js'), namespace: 'zod-locales-en' } : undefined));
    b.onLoad({ filter: /.*/, namespace: 'zod-locales-en' }, (args) => ({ contents: `export { default as en } from ${JSON.stringify(args.path)};`, resolveDir: path.dirname(args.path), loader: 'js' }));
  },
};

/**
 * Build the bundle with esbuild's JS API; returns false when it cannot. `key` and `options` (more
 * esbuild options, e.g. another format and plugins) for bundles other than the CLIs' (server/start.mjs).
 */
async function build({ entry, bundlePath, codeCachePath, metaPath }, { key = OPTIONS_KEY, options = {} } = {}) {
  let esbuild;
  try {
    esbuild = require('esbuild');
  } catch {
    return false;
  }
  const started = Date.now(); // taken before the build: a file saved during it triggers the next one
  const ext = path.extname(bundlePath);
  const tmp = path.join(cacheDir, `${path.basename(bundlePath, ext)}.${process.pid}.${started}.tmp${ext}`);
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
      plugins: [ZOD_LOCALES_EN],
      ...options,
    });
    const inputs = Object.keys(result.metafile.inputs).filter((p) => !p.startsWith('node_modules/') && !p.includes('/node_modules/'));
    renameSync(tmp, bundlePath);
    rmSync(codeCachePath, { force: true });
    const metaTmp = `${metaPath}.${process.pid}.tmp`;
    writeFileSync(metaTmp, JSON.stringify({ key, builtFrom: started - 1, inputs }));
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
function loadBundle({ entry, bundlePath, codeCachePath }, { storeWhen = () => true } = {}) {
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
    if ((cachedData !== undefined && !script.cachedDataRejected) || !storeWhen()) return;
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

/**
 * The lean start of CLI `name`, if it has one: undefined when it did the whole run, else what it
 * hands to the full CLI ({} when it could not run: no bundle, no esbuild).
 */
async function leanStart(name, argv) {
  const lean = LEAN[name];
  if (!lean || process.env.WYEWARD_CLI_NO_BUNDLE === '1' || process.env.WYEWARD_CLI_NO_LEAN === '1') return {};
  const paths = pathsOf(lean);
  if (!isFresh(paths) && !(await build(paths))) return {};
  let handOver;
  // Its code cache is written by a run it hands over: then it holds what every run needs (the
  // bundle's top level, main, the scan up to where it declined; 29 KB), and the typed path is
  // compiled when it runs. Measured: a cache written by a run it took (85 KB, the typed path
  // compiled too) cost the 10-element file ~300 more page faults (5 700 against 5 400 without
  // the lean start) and made no measurable difference to the 5 000-bus primitive-only file.
  const { cli, storeCache } = loadBundle(paths, { storeWhen: () => handOver !== undefined });
  handOver = cli.main(argv);
  storeCache();
  return handOver;
}

/** Run the CLI `name` (server/cli/<name>.ts, which exports main(argv)) on this process's arguments. */
async function launch(name) {
  const argv = process.argv.slice(2);
  const handOver = await leanStart(name, argv);
  if (handOver === undefined) return;
  const { cli, storeCache } = await loadCli(pathsOf(name));
  cli.main(argv, handOver);
  storeCache();
}

exports.launch = launch;
// for server/start.mjs, which builds and caches the server's own bundle the same way
exports.cacheDir = cacheDir;
exports.isFresh = isFresh;
exports.build = build;
