/**
 * `npm run bench`: speed of the engine's solver on random radial four-wire feeders (unbalanced wye
 * and delta loads, earthed neutrals, coupled 4×4 line sections), side by side with ngspice.
 * Prints figures only; nothing here is a test (speed is measured, never asserted).
 *
 * Per size (about 100 elements, 1 000, 5 000 and 20 000 buses):
 * - in-process: cold (analysis + first solve), warm solve of a prepared network (median of N) with
 *   its assembly / factor / solve split, and a full `solvePrimitives` (analysis included);
 * - `ngspice -b` on the same network as an AC netlist (binary raw output, no operating point);
 * - the CLI end to end, `npm run -s solve -- file.json --json` (start, read, solve, write), and the
 *   same program started directly, through tsx and through the bundled launcher (server/cli/solve-launcher.mjs);
 * - the ratio ngspice / CLI (issue targets: ≥ 5× at 5 000 buses, ≥ 20× at 20 000).
 * Then (./shapes.ts) the CLI whole process by file shape — the 10-element file, the primitive-only
 * and the block-heavy feeders at 5 000 and 20 000 buses — beside ngspice, with the stage split of
 * `--timings` and the machine load before and after (BENCH_SHAPE_SIZES, BENCH_NO_SHAPES=1).
 * Environment: BENCH_SIZES=25,1000 picks the sizes (25 buses ≈ 100 elements); BENCH_NO_SPICE=1 skips
 * ngspice; BENCH_SPICE_TIMEOUT_S (default 900) stops a long ngspice run (the ratio is then a lower bound).
 * Each row is printed as soon as it is measured.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import path from 'node:path';
import { createNetwork, solvePrimitives } from '../../shared/engine/solver/index.ts';
import type { Primitive } from '../../shared/engine/types.ts';
import { NGSPICE, NgspiceTimeout, runNgspice, toNetlist } from '../shared/engine/spice/netlist.ts';
import { radialFeeder } from './feeder.ts';
import { benchShapes } from './shapes.ts';

const root = path.resolve(import.meta.dirname, '../..');
const median = (xs: number[]) => {
  const s = xs.slice().sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) >> 1] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};
const ms = (x: number | undefined) => (x === undefined ? '—' : x >= 1000 ? `${(x / 1000).toFixed(2)} s` : `${x.toFixed(x < 10 ? 2 : 1)} ms`);

/** Wall time of a command, best of `runs` (the machine is shared; the best run is the least disturbed). */
function timeCommand(cmd: string, args: string[], runs: number): { best: number; ok: boolean; err: string } {
  let best = Infinity;
  let ok = true;
  let err = '';
  for (let r = 0; r < runs; r++) {
    const t0 = performance.now();
    const res = spawnSync(cmd, args, { cwd: root, stdio: ['ignore', 'ignore', 'pipe'], encoding: 'utf8' });
    const t = performance.now() - t0;
    if (res.status !== 0) {
      ok = false;
      err = (res.stderr ?? '').split('\n')[0];
    }
    best = Math.min(best, t);
  }
  return { best, ok, err };
}

interface Row {
  label: string;
  elements: number;
  unknowns: number;
  factorNnz: number;
  coldMs: number;
  warmMs: number;
  warmBestMs: number;
  warmAssembleMs: number;
  warmFactorSolveMs: number;
  fullMs: number;
  spiceMs?: number;
  spiceStopped?: boolean;
  cliMs?: number;
  cliNodeMs?: number;
  cliLauncherMs?: number;
  cliNote?: string;
}

const sizes = (process.env.BENCH_SIZES ?? '25,1000,5000,20000').split(',').map(Number);
const spiceOn = process.env.BENCH_NO_SPICE !== '1' && existsSync(NGSPICE);
const cliPath = path.join(root, 'server/cli/solve.ts');
const launcherPath = path.join(root, 'server/cli/solve-launcher.mjs');
const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-bench-'));
const rows: Row[] = [];
const HEADER = [
  '| network | elements | unknowns | LU non-zeros | cold (analyse + solve) | warm solve (median, best) | of which assembly | of which factor + solve | solvePrimitives (full) | ngspice -b | CLI (npm run -s solve --json) | CLI (node --import tsx) | CLI (node solve-launcher.mjs, bundled) | ngspice / CLI (npm) | ngspice / CLI (launcher) |',
  '|---|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|',
].join('\n');

console.log(`Wyeward solver benchmark — Node ${process.version}, ${cpus().length} cores, load average at start ${loadavg()[0].toFixed(2)}`);
console.log('Random radial four-wire feeders (seeded): wye/delta/single-phase loads, neutral earthed every 4th bus, coupled 4×4 line sections.\n');

try {
  for (const buses of sizes) {
    const file = radialFeeder(buses);
    const prims = file.elements as Primitive[];
    const label = buses < 100 ? `${prims.length} elements` : `${buses.toLocaleString('en-US')} buses`;
    process.stdout.write(`${label}: in-process… `);
    const t0 = performance.now();
    const net = createNetwork(prims);
    net.solve();
    const coldMs = performance.now() - t0;
    const reps = buses <= 100 ? 200 : buses <= 1000 ? 30 : buses <= 5000 ? 10 : 10;
    // the machine is shared: report the median and the best warm run
    const warm: number[] = [];
    const asm: number[] = [];
    const fs: number[] = [];
    for (let r = 0; r < reps; r++) {
      const t = performance.now();
      net.solve();
      warm.push(performance.now() - t);
      const lt = net.lastTimings();
      asm.push(lt.assembleMs);
      fs.push(lt.factorMs + lt.solveMs);
    }
    const full: number[] = [];
    for (let r = 0; r < Math.max(2, Math.min(reps, 5)); r++) {
      const t = performance.now();
      solvePrimitives(prims);
      full.push(performance.now() - t);
    }
    const row: Row = {
      label,
      elements: prims.length,
      unknowns: net.size,
      factorNnz: net.factorNonZeros,
      coldMs,
      warmMs: median(warm),
      warmBestMs: Math.min(...warm),
      warmAssembleMs: median(asm),
      warmFactorSolveMs: median(fs),
      fullMs: median(full),
    };
    const json = path.join(dir, `feeder-${buses}.json`);
    writeFileSync(json, JSON.stringify(file));
    if (spiceOn) {
      process.stdout.write('ngspice… ');
      const net2 = toNetlist(prims, file.frequencyHz);
      const limit = Number(process.env.BENCH_SPICE_TIMEOUT_S ?? 900) * 1000;
      const t = performance.now();
      try {
        row.spiceMs = runNgspice(net2.text, limit).ms;
      } catch (e) {
        if (e instanceof NgspiceTimeout) {
          row.spiceMs = performance.now() - t;
          row.spiceStopped = true;
        } else console.log(`ngspice failed: ${(e as Error).message.split('\n')[0]}`);
      }
    }
    if (existsSync(cliPath)) {
      process.stdout.write('CLI… ');
      const runs = buses >= 20000 ? 2 : 3;
      const viaNpm = timeCommand('npm', ['run', '-s', 'solve', '--', json, '--json'], runs);
      const direct = timeCommand(process.execPath, ['--import', 'tsx', cliPath, json, '--json'], runs);
      const launcher = timeCommand(process.execPath, [launcherPath, json, '--json'], runs);
      row.cliMs = viaNpm.best;
      row.cliNodeMs = direct.best;
      row.cliLauncherMs = launcher.best;
      if (!launcher.ok) row.cliNote = `launcher failed: ${launcher.err}`;
      if (!viaNpm.ok) row.cliNote = `CLI failed: ${viaNpm.err}`;
    } else {
      row.cliNote = 'server/cli/solve.ts not found';
    }
    rows.push(row);
    console.log('done');
    console.log(`  ${formatRow(row)}`);
  }
} finally {
  rmSync(dir, { recursive: true, force: true });
}

console.log('\n' + HEADER);
for (const r of rows) {
  console.log(formatRow(r));
  if (r.cliNote) console.log(`  note (${r.label}): ${r.cliNote}`);
}
console.log(`\nLoad average at the end ${loadavg()[0].toFixed(2)} on ${cpus().length} cores (figures scale with it on a shared machine).`);
console.log('Targets (issue 3): warm 100-element solve < 2 ms; warm 20 000-bus solve < 100 ms; CLI ≥ 5× faster than ngspice at 5 000 buses, ≥ 20× at 20 000.');
if (!spiceOn) console.log('ngspice not run (missing or BENCH_NO_SPICE=1).');
if (process.env.BENCH_NO_SHAPES !== '1') benchShapes();

function formatRow(r: Row): string {
  const stop = r.spiceStopped ? '> ' : '';
  const ratio = (cli: number | undefined) => (r.spiceMs !== undefined && cli !== undefined ? `${stop}${(r.spiceMs / cli).toFixed(1)}×` : '—');
  return `| ${r.label} | ${r.elements} | ${r.unknowns} | ${r.factorNnz} | ${ms(r.coldMs)} | ${ms(r.warmMs)} (best ${ms(r.warmBestMs)}) | ${ms(r.warmAssembleMs)} | ${ms(r.warmFactorSolveMs)} | ${ms(r.fullMs)} | ${stop}${ms(r.spiceMs)} | ${ms(r.cliMs)} | ${ms(r.cliNodeMs)} | ${ms(r.cliLauncherMs)} | ${ratio(r.cliMs)} | ${ratio(r.cliLauncherMs)} |`;
}
