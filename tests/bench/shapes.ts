/**
 * CLI whole-process speed by file shape (part of `npm run bench`; prints figures, asserts nothing):
 * - the 10-element file (./tiny-circuit.ts);
 * - the primitive-only feeder (./primitive-feeder.ts: ~8.4 impedances per bus, 42 000 at 5 000 buses);
 * - the block-heavy benchmark feeder (./feeder.ts: coupled 4×4 line sections);
 * at 5 000 and 20 000 buses (BENCH_SHAPE_SIZES). Per file: `ngspice -b` on the same network (AC
 * netlist of the expanded primitives, binary raw output), then the CLI started as a new process
 * three ways: its entry `server/cli/solve.sh f.json --json` (what `npm run solve` runs: node without
 * NODE_EXTRA_CA_CERTS, see solve.sh; the figure the targets are read on), the plain
 * `node server/cli/solve-launcher.mjs f.json --json` under this environment (with the variable when
 * it is set, so the difference shows), and `npm run -s solve -- f.json --json`, best of 3, side by
 * side in this one run; the ratios; and the CLI's own `--timings` split of its stages.
 * Wall time and CPU time (user + system, from /usr/bin/time): on a loaded machine the wall time
 * mostly measures the wait for a core, the CPU time much less so.
 * The machine load (`uptime`) is printed before and after: on a shared machine every figure moves
 * with it. Targets (issue 14): ≥ 5× faster than ngspice at 5 000 buses on both shapes, ≥ 20× at
 * 20 000 buses, the 10-element file in ≤ 150 ms.
 */
import { execSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { prepareCircuit } from '../../shared/engine/index.ts';
import { NGSPICE, toNetlist } from '../shared/engine/spice/netlist.ts';
import { radialFeeder } from './feeder.ts';
import { primitiveFeeder } from './primitive-feeder.ts';
import { tinyCircuit } from './tiny-circuit.ts';

const root = path.resolve(import.meta.dirname, '../..');
const ms = (x: number | undefined) => (x === undefined ? '—' : x >= 1000 ? `${(x / 1000).toFixed(2)} s` : `${x.toFixed(0)} ms`);
const uptime = () => {
  try {
    return execSync('uptime', { encoding: 'utf8' }).trim();
  } catch {
    return '(uptime unavailable)';
  }
};

const TIME = '/usr/bin/time';
const hasTime = existsSync(TIME);
const TIMEOUT = '/usr/bin/timeout';
const hasTimeout = existsSync(TIMEOUT);

/** One run of a command: wall time, and CPU time (user + system, via /usr/bin/time when present). */
function once(cmd: string, args: string[], timeoutMs?: number): { wall: number; cpu?: number; stderr: string; ok: boolean; stopped: boolean } {
  // The time limit is put on the command itself with timeout(1): killing only the /usr/bin/time
  // wrapper left a stopped ngspice running on, orphaned, for as long as it liked.
  const limited = timeoutMs !== undefined && hasTimeout ? [TIMEOUT, '-s', 'KILL', String(Math.ceil(timeoutMs / 1000)), cmd, ...args] : [cmd, ...args];
  const backstop = timeoutMs === undefined ? undefined : timeoutMs + 30_000;
  const t0 = performance.now();
  const res = hasTime
    ? spawnSync(TIME, ['-f', 'cpu-seconds %U %S', ...limited], { cwd: root, stdio: ['ignore', 'ignore', 'pipe'], encoding: 'utf8', maxBuffer: 1 << 26, timeout: backstop, killSignal: 'SIGKILL' })
    : spawnSync(limited[0], limited.slice(1), { cwd: root, stdio: ['ignore', 'ignore', 'pipe'], encoding: 'utf8', maxBuffer: 1 << 26, timeout: backstop, killSignal: 'SIGKILL' });
  const wall = performance.now() - t0;
  let stderr = res.stderr ?? '';
  let cpu: number | undefined;
  const m = /cpu-seconds ([\d.]+) ([\d.]+)\s*$/.exec(stderr);
  if (m) {
    cpu = (Number(m[1]) + Number(m[2])) * 1000;
    stderr = stderr.slice(0, m.index);
  }
  return { wall, cpu, stderr, ok: res.status === 0 && !/singular|aborted/i.test(stderr), stopped: res.signal === 'SIGKILL' || (limited[0] === TIMEOUT && (res.status === 124 || res.status === 137)) };
}

/** Best (least disturbed) of `runs` runs, by wall time; CPU time of that run. */
function best(cmd: string, args: string[], runs: number) {
  let b: ReturnType<typeof once> | undefined;
  for (let r = 0; r < runs; r++) {
    const x = once(cmd, args);
    if (!b || x.wall < b.wall) b = { ...x, ok: x.ok && (b?.ok ?? true) };
  }
  return b!;
}

/** Measure every shape; prints a table and the stage splits. */
export function benchShapes(): void {
  const sizes = (process.env.BENCH_SHAPE_SIZES ?? '5000,20000').split(',').map(Number);
  const spiceOn = process.env.BENCH_NO_SPICE !== '1' && existsSync(NGSPICE);
  const limit = Number(process.env.BENCH_SPICE_TIMEOUT_S ?? 900) * 1000;
  const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-shapes-'));
  const launcher = path.join(root, 'server/cli/solve-launcher.mjs');
  const entry = path.join(root, 'server/cli/solve.sh');
  const files: { label: string; file: object; target: string }[] = [{ label: '10-element file', file: tinyCircuit, target: '≤ 150 ms' }];
  for (const n of sizes) {
    const target = n >= 20000 ? '≥ 20×' : '≥ 5×';
    files.push({ label: `primitive-only ${n.toLocaleString('en-US')} buses`, file: primitiveFeeder(n), target });
    files.push({ label: `block-heavy ${n.toLocaleString('en-US')} buses`, file: radialFeeder(n), target });
  }
  console.log(`\nCLI whole process by file shape — ${uptime()}`);
  console.log(`NODE_EXTRA_CA_CERTS ${process.env.NODE_EXTRA_CA_CERTS ? `is set (${process.env.NODE_EXTRA_CA_CERTS}): the plain launcher's node loads it, solve.sh's does not` : 'is not set'}`);
  // warm the launcher's bundle and code cache once (a build is not part of any figure)
  spawnSync(process.execPath, [launcher, '--timings'], { cwd: root, stdio: 'ignore' });
  const rows: string[] = [];
  const splits: string[] = [];
  try {
    for (const { label, file, target } of files) {
      const json = path.join(dir, 'f.json');
      writeFileSync(json, JSON.stringify(file));
      const prims = prepareCircuit(file).primitives;
      let spice: ReturnType<typeof once> | undefined;
      if (spiceOn) {
        const cir = path.join(dir, 'f.cir');
        writeFileSync(cir, toNetlist(prims, 60).text);
        spice = once(NGSPICE, ['-b', '-r', path.join(dir, 'f.raw'), cir], limit);
        if (!spice.ok && !spice.stopped) console.log(`  ${label}: ngspice failed: ${spice.stderr.split('\n').slice(-3).join(' ')}`);
      }
      const runs = prims.length > 100000 ? 2 : 3;
      const viaEntry = best(entry, [json, '--json', '--timings'], runs);
      const direct = best(process.execPath, [launcher, json, '--json'], runs);
      const npm = best('npm', ['run', '-s', 'solve', '--', json, '--json'], runs);
      const stop = spice?.stopped ? '> ' : '';
      const ratio = (a: number | undefined, b: number | undefined) => (a === undefined || b === undefined ? '—' : `${stop}${(a / b).toFixed(a / b < 1 ? 2 : 1)}×`);
      const row = `| ${label} | ${prims.length} | ${stop}${ms(spice?.wall)} (cpu ${ms(spice?.cpu)}) | ${ms(viaEntry.wall)} (cpu ${ms(viaEntry.cpu)}) | ${ms(direct.wall)} (cpu ${ms(direct.cpu)}) | ${ms(npm.wall)} (cpu ${ms(npm.cpu)}) | ${ratio(spice?.wall, viaEntry.wall)} | ${ratio(spice?.cpu, viaEntry.cpu)} | ${ratio(spice?.wall, direct.wall)} | ${ratio(spice?.wall, npm.wall)} | ${target} |${viaEntry.ok && direct.ok && npm.ok ? '' : ' (CLI failed)'}`;
      rows.push(row);
      splits.push(`  ${label}: ${viaEntry.stderr.trim().replace(/^solve timings: /, '')}`);
      console.log(row);
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  console.log('\n| file | primitives | ngspice -b, wall (cpu) | CLI `solve.sh --json`, wall (cpu) | CLI `node solve-launcher.mjs --json`, wall (cpu) | CLI `npm run -s solve --json`, wall (cpu) | ngspice / CLI, wall (solve.sh) | ngspice / CLI, cpu (solve.sh) | ngspice / CLI, wall (launcher) | ngspice / CLI, wall (npm) | target |');
  console.log('|---|---:|---:|---:|---:|---:|---:|---:|---:|---:|---|');
  for (const r of rows) console.log(r);
  console.log('\nStages of the fastest solve.sh run (--timings):');
  for (const s of splits) console.log(s);
  console.log(`\nAfter: ${uptime()}`);
}
