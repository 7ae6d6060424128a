/**
 * The whole test suite: `npm test`.
 *
 * 1. Makes sure the Debian packages the tests need are present (chromium for the browser tests,
 *    poppler-utils for reading back the PDF report,
 *    ngspice for the engine's differential tests, postgresql for project server-pg, whose global
 *    setup starts a throwaway cluster from /usr/lib/postgresql/<version>/bin). Running as root with apt-get available, it
 *    installs the missing ones; otherwise it names exactly what is missing and fails. It never
 *    skips those tests silently.
 * 2. Runs ESLint over the repository (eslint.config.js: the architecture's import boundaries, the
 *    TanStack Query and React hooks rules); its result counts as one check, passed or failed.
 * 3. Runs every vitest project (shared, server, server-pg, client, e2e) and prints the plain closing line
 *    `N passed, N failed` that CI reads.
 *
 * Extra arguments go to vitest (`npm test -- --project shared`); such a partial run says that it
 * leaves the lint out (`npm run lint` runs it alone).
 */
import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import path from 'node:path';

const root = path.resolve(import.meta.dirname, '..');
/** The PostgreSQL server binaries of the Debian package, whatever its major version. */
function hasPostgres(): boolean {
  const base = '/usr/lib/postgresql';
  return existsSync(base) && readdirSync(base).some((v) => existsSync(path.join(base, v, 'bin', 'initdb')) && existsSync(path.join(base, v, 'bin', 'pg_ctl')));
}

const required: { bin: string; pkg: string; why: string; present?: () => boolean }[] = [
  { bin: '/usr/bin/chromium', pkg: 'chromium', why: 'browser tests (tests/e2e)' },
  { bin: '/usr/bin/ngspice', pkg: 'ngspice', why: 'engine differential tests against ngspice' },
  { bin: '/usr/bin/pdftotext', pkg: 'poppler-utils', why: 'study report tests (PDF read back with pdftotext, page 1 drawn with pdftoppm)' },
  { bin: '/usr/lib/postgresql/*/bin/initdb', pkg: 'postgresql', why: 'the server tests against PostgreSQL (project server-pg)', present: hasPostgres },
];

function missing() {
  return required.filter((r) => !(r.present ? r.present() : existsSync(r.bin)));
}

let absent = missing();
if (absent.length > 0) {
  const pkgs = absent.map((r) => r.pkg);
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
  const hasApt = existsSync('/usr/bin/apt-get');
  if (isRoot && hasApt) {
    console.log(`Installing Debian packages the tests need: ${pkgs.join(' ')}`);
    const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
    spawnSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
    spawnSync('apt-get', ['install', '-y', '-qq', ...pkgs], { stdio: 'inherit', env });
    absent = missing();
  }
  if (absent.length > 0) {
    console.error('Cannot run the whole suite: these Debian packages are missing.');
    for (const r of absent) console.error(`  ${r.pkg} (${r.bin}) — needed by ${r.why}`);
    console.error(`Install them with: sudo apt-get update && sudo apt-get install -y ${absent.map((r) => r.pkg).join(' ')}`);
    process.exit(1);
  }
}

let lintPassed = 0;
let lintFailed = 0;
if (process.argv.length > 2) {
  console.log('Lint not run: only part of the suite was asked for (`npm run lint` runs it).');
} else {
  console.log('Lint: eslint . (eslint.config.js)');
  const eslint = path.join(root, 'node_modules', 'eslint', 'bin', 'eslint.js');
  const lint = spawnSync(process.execPath, [eslint, '.', '--max-warnings=0'], { stdio: 'inherit', cwd: root });
  if (lint.status === 0) lintPassed = 1;
  else lintFailed = 1;
  console.log(lint.status === 0 ? 'Lint passed.' : 'Lint FAILED (see above).');
}

const resultFile = path.join(root, '.vitest-result.json');
rmSync(resultFile, { force: true });
const vitest = path.join(root, 'node_modules', 'vitest', 'vitest.mjs');
const run = spawnSync(
  process.execPath,
  [vitest, 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${resultFile}`, ...process.argv.slice(2)],
  { stdio: 'inherit', cwd: root },
);

let passed = 0;
let failed = 0;
if (existsSync(resultFile)) {
  const r = JSON.parse(readFileSync(resultFile, 'utf8')) as { numPassedTests: number; numFailedTests: number };
  passed = r.numPassedTests;
  failed = r.numFailedTests;
}
const testsRan = passed > 0;
passed += lintPassed;
failed += lintFailed;
console.log(`${passed} passed, ${failed} failed`);
const rc = run.status ?? 1;
process.exit(rc !== 0 ? rc : failed > 0 || !testsRan ? 1 : 0);
