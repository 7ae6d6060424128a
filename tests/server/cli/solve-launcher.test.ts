/**
 * The solve CLI's fast launcher (server/cli/solve-launcher.mjs): builds the bundle on first use,
 * reuses it while fresh, rebuilds when a source is newer than the build, prints exactly what the
 * tsx path prints, keeps the exit codes, and falls back to tsx when asked. The lean start
 * (solve-lean.ts, loaded first): takes `--json` of a primitive-only file alone, hands every other
 * file to the full bundle with the same bytes, and is rebuilt when stale like the full bundle.
 * The sh entry (server/cli/solve.sh, what `npm run solve` runs): the launcher's bytes and exit
 * codes, with NODE_EXTRA_CA_CERTS unset for node.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { demoCircuits } from '../../../shared/engine/index.ts';
import { primitiveFeeder } from '../../bench/primitive-feeder.ts';

const root = path.resolve(import.meta.dirname, '../../..');
const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-cli-launcher-'));
const cache = path.join(dir, 'cache');

function launch(args: string[], env: Record<string, string> = {}) {
  const r = spawnSync(process.execPath, ['server/cli/solve-launcher.mjs', ...args], { cwd: root, encoding: 'utf8', env: { ...process.env, WYEWARD_CLI_CACHE: cache, ...env } });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}
function viaTsx(args: string[]) {
  const r = spawnSync(process.execPath, ['--import', 'tsx', 'server/cli/solve.ts', ...args], { cwd: root, encoding: 'utf8' });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

const demo = demoCircuits.find((d) => d.key === 'delta-wye-bank')!;
const circuitFile = path.join(dir, 'bank.json');
writeFileSync(circuitFile, JSON.stringify(demo.circuit));
const bundle = path.join(cache, 'solve.cjs');
const meta = path.join(cache, 'solve.meta.json');
const leanBundle = path.join(cache, 'solve-lean.cjs');
const leanMeta = path.join(cache, 'solve-lean.meta.json');
const primitiveFile = path.join(dir, 'primitive.json');
writeFileSync(primitiveFile, JSON.stringify(primitiveFeeder(30)));

describe('solve CLI launcher', () => {
  it('builds the bundle on first use and prints exactly what the tsx path prints (JSON and report)', () => {
    const first = launch([circuitFile, '--json']);
    expect(first.stderr).toBe('');
    expect(first.code).toBe(0);
    expect(existsSync(bundle)).toBe(true);
    const m = JSON.parse(readFileSync(meta, 'utf8'));
    expect(m.inputs).toContain('server/cli/solve.ts');
    expect(m.inputs).toContain('shared/engine/solver/network.ts');
    expect(first.stdout).toBe(viaTsx([circuitFile, '--json']).stdout);
    expect(launch([circuitFile]).stdout).toBe(viaTsx([circuitFile]).stdout);
  });

  it('reuses a fresh bundle and rebuilds one older than its sources', () => {
    launch([circuitFile, '--json']);
    const builtAt = statSync(bundle).mtimeMs;
    const again = launch([circuitFile, '--json']);
    expect(again.code).toBe(0);
    expect(statSync(bundle).mtimeMs).toBe(builtAt); // fresh: not rebuilt
    // pretend the build predates every source: the next run must rebuild
    const m = JSON.parse(readFileSync(meta, 'utf8'));
    writeFileSync(meta, JSON.stringify({ ...m, builtFrom: 0 }));
    const rebuilt = launch([circuitFile, '--json']);
    expect(rebuilt.code).toBe(0);
    expect(JSON.parse(readFileSync(meta, 'utf8')).builtFrom).toBeGreaterThan(0);
    expect(statSync(bundle).mtimeMs).not.toBe(builtAt);
  });

  it('keeps the exit codes and the one-line stderr messages', () => {
    const missing = launch([path.join(dir, 'nope.json'), '--json']);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/^solve: cannot read .*nope\.json: ENOENT\n$/);
    const usage = launch([]);
    expect(usage.code).toBe(2);
    expect(usage.stderr).toBe('solve: usage: solve <file.json> [--json [--full]] [--case <id> | --all-cases]\n');
    const ill = path.join(dir, 'ill.json');
    writeFileSync(
      ill,
      JSON.stringify({
        format: 'wyeward-circuit',
        version: 1,
        frequencyHz: 60,
        elements: [
          { type: 'voltageSource', id: 'V1', plus: 'a', minus: 'earth', volts: { re: 100, im: 0 } },
          { type: 'voltageSource', id: 'V2', plus: 'a', minus: 'earth', volts: { re: 110, im: 0 } },
        ],
      }),
    );
    const r = launch([ill, '--json']);
    expect(r.code).toBe(3);
    expect(r.stderr).toMatch(/^solve: Ideal voltage sources 'V1', 'V2'.*\n$/);
  });

  it('--timings adds one stderr line splitting the run', () => {
    const r = launch([circuitFile, '--json', '--timings']);
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/^solve timings: start-up \+ imports \d+ ms, read \d+ ms, JSON parse \d+ ms, validate \+ expand \d+ ms, solve \d+ ms, results \d+ ms, JSON write \d+ ms; total \d+ ms since process start\n$/);
    expect(JSON.parse(r.stdout).format).toBe('wyeward-result');
  });

  it('the lean start takes --json of a primitive-only file without the full bundle, same bytes', () => {
    const other = path.join(dir, 'lean-only-cache');
    const r = launch([primitiveFile, '--json', '--timings'], { WYEWARD_CLI_CACHE: other });
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/^solve timings: start-up \+ imports \d+ ms, read \d+ ms, scan \(parse \+ validate\) \d+ ms, solve \d+ ms, results \+ JSON write \d+ ms; total \d+ ms since process start\n$/);
    expect(existsSync(path.join(other, 'solve-lean.cjs'))).toBe(true);
    expect(existsSync(path.join(other, 'solve.cjs'))).toBe(false); // never needed
    const inputs: string[] = JSON.parse(readFileSync(path.join(other, 'solve-lean.meta.json'), 'utf8')).inputs;
    expect(inputs).toContain('server/cli/solve-lean.ts');
    expect(inputs).toContain('shared/engine/typed/scan-primitive-file.ts');
    expect(inputs.filter((p) => p.startsWith('shared/engine/schema/') || p.startsWith('shared/engine/blocks/'))).toEqual([]);
    expect(readFileSync(path.join(other, 'solve-lean.cjs'), 'utf8')).not.toMatch(/node_modules[\\/]zod/);
    const general = viaTsx([primitiveFile, '--json']).stdout;
    expect(r.stdout).toBe(general);
    expect(launch([primitiveFile, '--json'], { WYEWARD_CLI_NO_LEAN: '1' }).stdout).toBe(general);
  });

  it('the lean start hands a file with building blocks, and other options, to the full bundle (same bytes)', () => {
    const other = path.join(dir, 'fallback-cache');
    const r = launch([circuitFile, '--json', '--timings'], { WYEWARD_CLI_CACHE: other });
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/^solve timings: start-up \+ imports \d+ ms, read \d+ ms, JSON parse \d+ ms, validate/);
    expect(existsSync(path.join(other, 'solve-lean.cjs'))).toBe(true);
    expect(existsSync(path.join(other, 'solve.cjs'))).toBe(true);
    expect(r.stdout).toBe(viaTsx([circuitFile, '--json']).stdout);
    // its code cache is written by a run it hands over (not by one it takes: see leanStart)
    expect(existsSync(path.join(other, 'solve-lean.cjs.v8cache'))).toBe(true);
    const other2 = path.join(dir, 'typed-first-cache');
    expect(launch([primitiveFile, '--json'], { WYEWARD_CLI_CACHE: other2 }).code).toBe(0);
    expect(existsSync(path.join(other2, 'solve-lean.cjs.v8cache'))).toBe(false);
    // --full, a case, or the report: the full CLI's output
    for (const args of [[primitiveFile, '--json', '--full'], [primitiveFile], [primitiveFile, '--json', '--case', 'base']]) {
      expect(launch(args, { WYEWARD_CLI_CACHE: other }).stdout).toBe(viaTsx(args).stdout);
    }
  });

  it('rebuilds a lean bundle older than its sources', () => {
    launch([primitiveFile, '--json']);
    const builtAt = statSync(leanBundle).mtimeMs;
    const m = JSON.parse(readFileSync(leanMeta, 'utf8'));
    writeFileSync(leanMeta, JSON.stringify({ ...m, builtFrom: 0 }));
    const r = launch([primitiveFile, '--json']);
    expect(r.code).toBe(0);
    expect(JSON.parse(readFileSync(leanMeta, 'utf8')).builtFrom).toBeGreaterThan(0);
    expect(statSync(leanBundle).mtimeMs).not.toBe(builtAt);
    expect(r.stdout).toBe(viaTsx([primitiveFile, '--json']).stdout);
  });

  it('the full bundle carries zod’s English messages only', () => {
    launch([circuitFile, '--json']);
    const text = readFileSync(bundle, 'utf8');
    expect(text).toMatch(/zod[\\/]v4[\\/]locales[\\/]en\.js/);
    expect(text).not.toMatch(/zod[\\/]v4[\\/]locales[\\/]de\.js/);
    // and a schema error still reads as before (zod's English message through the engine)
    const bad = path.join(dir, 'bad.json');
    writeFileSync(bad, JSON.stringify({ format: 'wyeward-circuit', version: 1, frequencyHz: 'sixty', elements: [] }));
    const r = launch([bad, '--json']);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(viaTsx([bad, '--json']).stderr);
  });

  it('the sh entry prints what the launcher prints, keeps its exit codes and starts node without NODE_EXTRA_CA_CERTS', () => {
    const env = { ...process.env, WYEWARD_CLI_CACHE: cache, NODE_EXTRA_CA_CERTS: path.join(dir, 'no-such-bundle.pem') };
    const sh = (args: string[], cwd = root, entry = 'server/cli/solve.sh') => spawnSync(entry, args, { cwd, encoding: 'utf8', env });
    for (const args of [[circuitFile, '--json'], [primitiveFile, '--json'], [circuitFile]]) {
      const r = sh(args);
      expect(r.stderr).toBe('');
      expect(r.status).toBe(0);
      expect(r.stdout).toBe(launch(args).stdout);
    }
    // started from its own folder, and through sh by name
    expect(spawnSync('sh', ['solve.sh', primitiveFile, '--json'], { cwd: path.join(root, 'server/cli'), encoding: 'utf8', env }).stdout).toBe(launch([primitiveFile, '--json']).stdout);
    const missing = sh([path.join(dir, 'nope.json'), '--json']);
    expect(missing.status).toBe(2);
    expect(missing.stderr).toMatch(/^solve: cannot read .*nope\.json: ENOENT\n$/);
    // node warns about an unreadable NODE_EXTRA_CA_CERTS at start-up; through the sh entry it never reads it
    const direct = spawnSync(process.execPath, ['server/cli/solve-launcher.mjs', circuitFile, '--json'], { cwd: root, encoding: 'utf8', env });
    expect(direct.stderr).toMatch(/extra certs from .*no-such-bundle\.pem/);
    expect(JSON.parse(readFileSync(path.join(root, 'package.json'), 'utf8')).scripts.solve).toBe('server/cli/solve.sh');
  });

  it('writes standard output whole through a pipe, and stops quietly when the reader goes away', () => {
    const big = path.join(dir, 'big.json');
    writeFileSync(big, JSON.stringify(primitiveFeeder(400, 3)));
    const env = { ...process.env, WYEWARD_CLI_CACHE: cache };
    const whole = launch([big, '--json']).stdout;
    expect(whole.length).toBeGreaterThan(300_000); // more than a pipe holds
    const piped = spawnSync('sh', ['-c', `server/cli/solve.sh '${big}' --json | cat`], { cwd: root, encoding: 'utf8', env, maxBuffer: 1 << 26 });
    expect(piped.stdout).toBe(whole);
    for (const args of [`'${big}' --json`, `'${big}' --json --full`, `'${big}'`]) {
      const cut = spawnSync('sh', ['-c', `server/cli/solve.sh ${args} | head -c 100 >/dev/null`], { cwd: root, encoding: 'utf8', env });
      expect(cut.stderr).toBe('');
    }
  });

  it('WYEWARD_CLI_NO_BUNDLE=1 runs the TypeScript through tsx, same output', () => {
    const other = path.join(dir, 'unused-cache');
    const r = launch([circuitFile, '--json'], { WYEWARD_CLI_NO_BUNDLE: '1', WYEWARD_CLI_CACHE: other });
    expect(r.code).toBe(0);
    expect(existsSync(other)).toBe(false);
    expect(r.stdout).toBe(viaTsx([circuitFile, '--json']).stdout);
  });
});
