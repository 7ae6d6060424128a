/**
 * Sweep CLI throughput: `node server/cli/sweep-launcher.mjs f.json --set …` on the 10-element
 * service file and on a random radial feeder of about 100 elements, 1 000 points each, CSV and
 * --json, wall time of the whole process (start-up included; the bundle built beforehand), best of
 * 2, with `uptime` before and after. Prints a table; asserts nothing.
 * Run: `node --import tsx tests/bench/sweep-cli.ts` (`SWEEP_POINTS=n` to change the count).
 */
import { execSync, spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { radialFeeder } from './feeder.ts';
import { tinyCircuit } from './tiny-circuit.ts';

const root = path.resolve(import.meta.dirname, '../..');
const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-sweep-bench-'));
const points = Number(process.env.SWEEP_POINTS ?? 1000);
const feeder = radialFeeder(20);
const files = [
  { label: `10-element service (${tinyCircuit.elements.length} elements)`, circuit: tinyCircuit, set: `LA.each.kw=0.5:5:${points}` },
  { label: `radial feeder (${feeder.elements.length} primitives)`, circuit: feeder, set: `src.a.seriesOhms.re=0.01:0.2:${points}` },
];

function run(file: string, set: string, json: boolean): number {
  const t = performance.now();
  const r = spawnSync(process.execPath, ['server/cli/sweep-launcher.mjs', file, '--set', set, ...(json ? ['--json'] : [])], { cwd: root, encoding: 'utf8', maxBuffer: 1 << 30 });
  const ms = performance.now() - t;
  if (r.status !== 0) throw new Error(`sweep failed (${r.status}): ${r.stderr}`);
  return ms;
}

console.log(`uptime before: ${execSync('uptime').toString().trim()}`);
const rows: string[] = [];
for (const f of files) {
  const p = path.join(dir, 'f.json');
  writeFileSync(p, JSON.stringify(f.circuit));
  run(p, f.set.replace(/:\d+$/, ':2'), false); // build the bundle / warm the code cache
  for (const json of [false, true]) {
    const ms = Math.min(run(p, f.set, json), run(p, f.set, json));
    rows.push(`| ${f.label} | ${points} | ${json ? '--json' : 'CSV'} | ${(ms / 1000).toFixed(2)} s | ${Math.round((points * 1000) / ms)} |`);
  }
}
console.log('\n| file | points | output | wall, whole process (best of 2) | points / s |\n|---|---:|---|---:|---:|');
console.log(rows.join('\n'));
console.log(`\nuptime after: ${execSync('uptime').toString().trim()}`);
