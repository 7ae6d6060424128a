/**
 * The solve CLI's fast launcher (server/cli/solve-launcher.mjs): builds the bundle on first use,
 * reuses it while fresh, rebuilds when a source is newer than the build, prints exactly what the
 * tsx path prints, keeps the exit codes, and falls back to tsx when asked.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { demoCircuits } from '../../../shared/engine/index.ts';

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

  it('WYEWARD_CLI_NO_BUNDLE=1 runs the TypeScript through tsx, same output', () => {
    const other = path.join(dir, 'unused-cache');
    const r = launch([circuitFile, '--json'], { WYEWARD_CLI_NO_BUNDLE: '1', WYEWARD_CLI_CACHE: other });
    expect(r.code).toBe(0);
    expect(existsSync(other)).toBe(false);
    expect(r.stdout).toBe(viaTsx([circuitFile, '--json']).stdout);
  });
});
