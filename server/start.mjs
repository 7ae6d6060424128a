/**
 * What `npm start` runs: server/index.ts from an ES-module bundle of the server's own sources
 * (node_modules left as imports), built with esbuild and cached beside the CLIs' bundles, the same
 * way (server/cli/launcher.cjs: rebuilt when any source it was built from, or package-lock.json,
 * is newer than the build; written under a temporary name and renamed; tsx when it cannot be
 * built, which then reports the real problem). WYEWARD_SERVER_NO_BUNDLE=1 runs through tsx.
 *
 * Why: through `--import tsx`, the server process keeps tsx's loader: a hooks thread with its own
 * heap (~17 MB) and the transformed sources, on top of the app; measured at idle, the bundle
 * holds less memory (docs/performance-log.md) and starts without transforming ~200 files.
 *
 * Each source keeps its own `import.meta.url` and `import.meta.dirname` (written into the bundle
 * as the file's own location), so paths relative to a source file (migrations, the database
 * thread, the work pool's worker, fonts) are what they are without the bundle. Packages are
 * imported by their resolved file URLs, resolved here as an unbundled source would resolve them,
 * so the bundle runs from any cache folder. The work pool's threads still load their TypeScript
 * through tsx (server/work/pool.ts).
 */
import { isBuiltin } from 'node:module';
import path from 'node:path';
import { readFileSync } from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';
import launcher from './cli/launcher.cjs';

const { build, cacheDir, isFresh } = launcher;

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const entry = path.join(root, 'server/index.ts');

/** The server bundle's files in the cache folder. */
export const serverPaths = {
  entry,
  bundlePath: path.join(cacheDir, 'server.mjs'),
  codeCachePath: path.join(cacheDir, 'server.mjs.unused'),
  metaPath: path.join(cacheDir, 'server.meta.json'),
};

/** Changing the build below must change this key; the project root is part of it (package URLs are absolute). */
export const SERVER_KEY = `esm-node20-server-v1 ${root}`;

/** esbuild plugin: a source's import.meta.url / import.meta.dirname / import.meta.filename as its own file's. */
const IMPORT_META_OF_SOURCE = {
  name: 'import-meta-of-source',
  setup(b) {
    b.onLoad({ filter: /\.(ts|mts|js|mjs)$/ }, (args) => {
      if (args.path.includes(`${path.sep}node_modules${path.sep}`)) return undefined;
      const text = readFileSync(args.path, 'utf8');
      if (!text.includes('import.meta')) return undefined;
      const contents = text
        .replaceAll('import.meta.url', JSON.stringify(pathToFileURL(args.path).href))
        .replaceAll('import.meta.dirname', JSON.stringify(path.dirname(args.path)))
        .replaceAll('import.meta.filename', JSON.stringify(args.path));
      return { contents, loader: /\.m?ts$/.test(args.path) ? 'ts' : 'js' };
    });
  },
};

/** esbuild plugin: every package import left as an import of the file an unbundled source would load. */
const PACKAGES_BY_URL = {
  name: 'packages-by-url',
  setup(b) {
    b.onResolve({ filter: /^[^./]/ }, (args) => {
      if (isBuiltin(args.path)) return { path: args.path, external: true };
      return { path: import.meta.resolve(args.path), external: true };
    });
  },
};

/** The server's build options for launcher.cjs's build(). */
const serverBuild = {
  key: SERVER_KEY,
  options: { format: 'esm', target: 'node20', plugins: [IMPORT_META_OF_SOURCE, PACKAGES_BY_URL], banner: { js: '// Wyeward server bundle (server/start.mjs)' } },
};

/** The fresh bundle's path (built now when stale), or null when it cannot be built. */
export async function serverBundle() {
  if (isFresh(serverPaths, SERVER_KEY) || (await build(serverPaths, serverBuild))) return serverPaths.bundlePath;
  return null;
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const bundle = process.env.WYEWARD_SERVER_NO_BUNDLE === '1' ? null : await serverBundle();
  if (bundle) {
    await import(pathToFileURL(bundle).href);
  } else {
    const { register } = await import('tsx/esm/api');
    register();
    await import(pathToFileURL(entry).href);
  }
}
