/**
 * The sweep CLI as a real child process (through its launcher, as `npm run sweep` runs it): CSV and
 * JSON output, the lost-neutral check against Millman's theorem (J. Millman, "A useful network
 * theorem", Proc. IRE 28 (1940); evaluated independently in the fixture), failing points, exit codes.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { applyCase, lostNeutralEnvelope, solveCircuit, sweepCircuit, type CircuitInput } from '../../../shared/engine/index.ts';
import { jsonResult } from '../../../server/cli/solve.ts';
import { cabs, LOADS, millman, serviceCircuit } from '../../shared/engine/cases/lost-neutral-fixture.ts';

const root = path.resolve(import.meta.dirname, '../../..');
const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-cli-sweep-'));
const cache = path.join(dir, 'cache');

function sweep(args: string[], how: 'launcher' | 'tsx' = 'launcher') {
  const entry = how === 'launcher' ? ['server/cli/sweep-launcher.mjs'] : ['--import', 'tsx', 'server/cli/sweep.ts'];
  const r = spawnSync(process.execPath, [...entry, ...args], { cwd: root, encoding: 'utf8', env: { ...process.env, WYEWARD_CLI_CACHE: cache } });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}
function solveJson(circuit: unknown): string {
  const p = file(`point-${Math.random().toString(36).slice(2)}.json`, circuit);
  const r = spawnSync(process.execPath, ['server/cli/solve-launcher.mjs', p, '--json'], { cwd: root, encoding: 'utf8', env: { ...process.env, WYEWARD_CLI_CACHE: cache } });
  expect(r.status).toBe(0);
  return r.stdout;
}
function file(name: string, content: unknown): string {
  const p = path.join(dir, name);
  writeFileSync(p, JSON.stringify(content));
  return p;
}
const csv = (text: string) => text.trim().split('\n').map((l) => l.split(','));

const openNoRod = file('open.json', serviceCircuit(LOADS, null, ['n']));
const studyCircuit = {
  ...serviceCircuit(LOADS, 25, []),
  cases: [
    { id: 'lost-n', name: 'Neutral lost at the drop', changes: [{ element: 'DROP', set: { open: ['n'] } }] },
    { id: 'short', name: 'Shorted', changes: [{ add: { type: 'switch', id: 'SHORT', from: 'PAD.a', to: 'earth', closed: true } }] },
  ],
} as CircuitInput;
const study = file('study.json', studyCircuit);

describe('sweep CLI', () => {
  it("CSV: a kW sweep on the open neutral agrees with Millman's theorem at every point (C)", () => {
    const r = sweep([openNoRod, '--set', 'KITCHEN.each.kw=0.2:6:12']);
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/^CAUTION: .*Lost-neutral conditions put dangerous voltages on equipment\.\n$/);
    const [header, ...rows] = csv(r.stdout);
    expect(header).toEqual(['KITCHEN.each.kw (kW)', 'PAD a-n (V)', 'PAD b-n (V)', 'PAD c-n (V)', 'PAD n-earth (V)', 'HOUSE a-n (V)', 'HOUSE b-n (V)', 'HOUSE c-n (V)', 'HOUSE n-earth (V)', 'status']);
    expect(rows).toHaveLength(12);
    const col = (name: string) => header.indexOf(name);
    rows.forEach((row, k) => {
      const kw = 0.2 + ((6 - 0.2) * k) / 11;
      expect(Number(row[0])).toBeCloseTo(kw, 9);
      const m = millman({ ...LOADS, a: { ...LOADS.a, kw } }, null);
      // 10 significant digits in the CSV
      expect(Math.abs(Number(row[col('HOUSE n-earth (V)')]) - cabs(m.star))).toBeLessThan(1e-6);
      for (const k2 of ['a', 'b', 'c'] as const) {
        const ln = cabs({ re: m.house[k2].re - m.star.re, im: m.house[k2].im - m.star.im });
        expect(Math.abs(Number(row[col(`HOUSE ${k2}-n (V)`)]) - ln)).toBeLessThan(1e-6);
      }
      expect(row[row.length - 1]).toBe('ok');
    });
  });

  it('--json on a case, two parameters: each point is exactly what solve --json prints for that circuit', () => {
    const r = sweep([study, '--case', 'lost-n', '--set', 'KITCHEN.each.kw=1:3:3', '--set', 'ROD.ohms=1:1000:2:log', '--json']);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.parameters).toEqual(['KITCHEN.each.kw', 'ROD.ohms']);
    expect(out.points.map((p: { values: number[] }) => p.values)).toEqual([[1, 1], [1, 1000], [2, 1], [2, 1000], [3, 1], [3, 1000]]);
    const lost = applyCase(studyCircuit, 'lost-n');
    for (const p of out.points) {
      expect(Object.keys(p)).toEqual(['values', 'nodes', 'elements', 'flags']);
      const j = JSON.parse(JSON.stringify(jsonResult(solveCircuit(sweepCircuit(lost, out.parameters, p.values)))));
      expect(p).toEqual({ values: p.values, nodes: j.nodes, elements: j.elements, flags: j.flags });
    }
    // and one point against the solve CLI itself, text for text
    const point = JSON.parse(solveJson(sweepCircuit(lost, out.parameters, [2, 1000])));
    expect(out.points[3]).toEqual({ values: [2, 1000], nodes: point.nodes, elements: point.elements, flags: point.flags });
  });

  it('a failing point is reported in its row and the sweep goes on; exit code as for solve', () => {
    const r = sweep([study, '--set', 'DROP.length=-10:10:3']);
    expect(r.code).toBe(2);
    const [, ...rows] = csv(r.stdout);
    expect(rows).toHaveLength(3);
    expect(rows[0].slice(1, -1).every((c) => c === '')).toBe(true);
    expect(rows[0][rows[0].length - 1]).toMatch(/length/);
    expect(rows[2][rows[2].length - 1]).toBe('ok');
    expect(r.stderr.trim().split('\n').pop()).toMatch(/^sweep: \d of 3 points failed; first at DROP\.length = -10: /);
    // a case that cannot be solved: every point fails, exit 3, JSON entries carry the error
    const s = sweep([study, '--case', 'short', '--set', 'ROD.ohms=1:2:2', '--json']);
    expect(s.code).toBe(3);
    const out = JSON.parse(s.stdout);
    expect(out.points).toHaveLength(2);
    expect(out.points[0].error.code).toBe('ill-posed-network');
    expect(s.stderr.trim().split('\n').pop()).toMatch(/^sweep: 2 of 2 points failed; first at ROD\.ohms = 1: .*SHORT/);
  });

  it('bad input: exit 2 with one stderr line, nothing on stdout', () => {
    const cases: [string[], RegExp][] = [
      [[study, '--set', 'KITCHN.each.kw=1:2:2'], /no element "KITCHN"/],
      [[study, '--set', 'KITCHEN.each.kw=1:2'], /<from>:<to>:<steps>/],
      [[study, '--set', 'KITCHEN.each.kw=1:2:0'], /whole number ≥ 1/],
      [[study, '--set', 'KITCHEN.each=1:2:2'], /not a number/],
      [[study, '--set', 'ROD.bogus=1:2:2'], /Unrecognized key: "bogus"/],
      [[study, '--set', 'ROD.ohms=0:2:3:log'], /above 0/],
      [[study, '--set', 'ROD.ohms=1:2:2', '--case', 'peak'], /no case "peak"/],
      [[study], /one or two --set/],
      [[study, '--set', 'ROD.ohms=1:2:2', '--set', 'ROD.ohms=1:2:2', '--set', 'ROD.ohms=1:2:2'], /one or two --set/],
      [[path.join(dir, 'missing.json'), '--set', 'ROD.ohms=1:2:2'], /cannot read/],
    ];
    for (const [args, message] of cases) {
      const r = sweep(args);
      expect(r.code, args.join(' ')).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr.trim().split('\n')).toHaveLength(1);
      expect(r.stderr).toMatch(message);
    }
  });

  it('--envelope: the lost-neutral envelope of a bus on a case, as the engine computes it (checked against Millman in tests/shared)', () => {
    const expected = lostNeutralEnvelope(applyCase(studyCircuit, 'lost-n'), { bus: 'HOUSE', fromFraction: 0.2, toFraction: 1, steps: 3 });
    const j = sweep([study, '--case', 'lost-n', '--envelope', 'HOUSE', '--levels', '0.2:1:3', '--json']);
    expect(j.code).toBe(0);
    expect(JSON.parse(j.stdout)).toEqual(JSON.parse(JSON.stringify(expected)));
    const text = sweep([study, '--case', 'lost-n', '--envelope', 'HOUSE', '--levels', '0.2:1:3']);
    expect(text.stdout.split('\n')[0]).toBe('Lost-neutral envelope at HOUSE: each load from 20 % to 100 % of its value in 3 levels, 27 combinations solved');
    expect(text.stdout).toContain('A lost neutral is a hazard to remove');
    const k = expected.loads[0];
    expect(text.stdout).toContain(`  KITCHEN (a-n): ${k.minVolts.toFixed(1)} V to ${k.maxVolts.toFixed(1)} V`);
    expect(text.stdout).toContain(`${(100 * expected.outsideShare).toFixed(1)} %`);
    const both = sweep([study, '--envelope', 'HOUSE', '--set', 'ROD.ohms=1:2:2']);
    expect(both.code).toBe(2);
    expect(both.stderr).toMatch(/cannot be used together/);
    const noLoads = sweep([study, '--envelope', 'PAD']);
    expect(noLoads.code).toBe(2);
    expect(noLoads.stderr).toBe('sweep: bus PAD: no single-phase kW loads between a phase and the neutral to vary\n');
  });

  it('the launcher prints exactly what the TypeScript entry prints', () => {
    const args = [study, '--set', 'ROD.ohms=0.1:1e6:4:log', '--case', 'lost-n'];
    const a = sweep(args);
    expect(a.code).toBe(0);
    expect(sweep(args, 'tsx').stdout).toBe(a.stdout);
  });
});
