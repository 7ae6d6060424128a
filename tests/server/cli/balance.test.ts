/**
 * The balance CLI as a real child process (through its launcher, as `npm run balance` runs it):
 * the JSON shape, every figure equal to an independent exact solve of its assignment, the move
 * limit, the caution with the move list and in the moves CSV, and exit codes on bad input.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyseFeeder, balanceScore, currentAssignment, exactFigures, mixNormalisers, neutralPoint, parseCustomersCsv, solveAssignment, type Assignment, type ObjectiveSpec } from '../../../shared/engine/index.ts';
import { smallFeeder } from '../../shared/engine/balancing/small-feeder.ts';

const root = path.resolve(import.meta.dirname, '../../..');
const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-cli-balance-'));
const cache = path.join(dir, 'cache');

function balance(args: string[]) {
  const r = spawnSync(process.execPath, ['server/cli/balance-launcher.mjs', ...args], { cwd: root, encoding: 'utf8', env: { ...process.env, WYEWARD_CLI_CACHE: cache } });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}
function file(name: string, content: string): string {
  const p = path.join(dir, name);
  writeFileSync(p, content);
  return p;
}

const CSV = `customer,bus,phase,kw,kvar,fixed,phases
H1,P1,A,4.2,1.0,,
H2,P1,A,2.5,0.6,,
H3,P2,A,6.0,1.5,,
H4,P2,B,1.2,0.3,yes,
H5,P3,A,3.4,0.9,,
H6,P3,A,5.1,1.2,,AB
H7,P3,C,0.8,0.2,,
`;
const customersFile = file('customers.csv', CSV);
const feederFile = file('feeder.json', JSON.stringify(smallFeeder));
const customers = parseCustomersCsv(CSV);
const feeder = analyseFeeder(smallFeeder);

/** Figures of an assignment by the engine, here in the test process. */
function figuresOf(a: Assignment) {
  const r = solveAssignment(feeder, customers, a);
  return exactFigures(r, customers, neutralPoint(feeder, r)).figures;
}

describe('balance CLI', () => {
  it('--json: the issue shape, figures of exact solves, at most --max-moves moves', () => {
    const r = balance([customersFile, '--feeder', feederFile, '--objective', 'losses', '--max-moves', '3', '--json']);
    expect(r.code).toBe(0);
    expect(r.stderr).toContain('CAUTION');
    const j = JSON.parse(r.stdout);
    expect(Object.keys(j)).toEqual(['objective', 'assignment', 'moves', 'before', 'after', 'rotatingRule', 'gapPercent']);
    expect(j.objective).toBe('losses');
    expect(Object.keys(j.before)).toEqual(['neutralCurrentA', 'maxUnbalancePercent', 'lossesKw', 'minCustomerVoltagePu', 'maxCustomerVoltagePu']);
    expect(Object.keys(j.before.maxUnbalancePercent)).toEqual(['iec', 'nema', 'ieee']);
    expect(j.moves.length).toBeGreaterThan(0);
    expect(j.moves.length).toBeLessThanOrEqual(3);
    for (const m of j.moves) {
      expect(Object.keys(m)).toEqual(['customer', 'bus', 'from', 'to']);
      expect(j.assignment[m.customer]).toBe(m.to);
      expect(customers.find((c) => c.customer === m.customer)!.phase).toBe(m.from);
    }
    expect(j.assignment.H4).toBe('B');
    const present = Object.fromEntries(customers.map((c) => [c.customer, c.phase]));
    for (const [key, a] of [['before', present], ['after', j.assignment]] as const) {
      const f = figuresOf(a);
      expect(j[key].lossesKw).toBeCloseTo(f.lossesKw, 9);
      expect(j[key].neutralCurrentA).toBeCloseTo(f.neutralCurrentA, 9);
      expect(j[key].maxUnbalancePercent.ieee).toBeCloseTo(f.maxUnbalancePercent.ieee, 9);
      expect(j[key].minCustomerVoltagePu).toBeCloseTo(f.minCustomerVoltagePu, 9);
    }
    // the rotating rule in feeder order: P1 (H1 A, H2 B), P2 (H3 C, H4 fixed B), P3 (H5 A, H6 B, H7 C)
    expect(j.rotatingRule.lossesKw).toBeCloseTo(figuresOf({ H1: 'A', H2: 'B', H3: 'C', H4: 'B', H5: 'A', H6: 'B', H7: 'C' }).lossesKw, 9);
    expect(j.after.lossesKw).toBeLessThan(j.before.lossesKw);
    expect(j.gapPercent).toBeGreaterThanOrEqual(0);
  });

  it('text: the move list with the caution, the table, and the moves CSV with the caution', () => {
    const movesFile = path.join(dir, 'moves.csv');
    const r = balance([customersFile, '--feeder', feederFile, '--objective', 'unbalance', '--definition', 'nema', '--moves-csv', movesFile]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/Phase balancing: minimise the worst voltage unbalance along the feeder \(line voltages, NEMA\)/);
    expect(r.stdout).toContain('Phase moves are work on live equipment');
    expect(r.stdout).toMatch(/Moves for the crew \(\d+\):/);
    expect(r.stdout).toContain('rotating rule');
    const moves = readFileSync(movesFile, 'utf8').trim().split('\r\n');
    expect(moves[0]).toMatch(/^# Caution: .*live equipment/);
    expect(moves[1]).toBe('customer,bus,from,to');
  });

  it('--objective mix --weights: figures of exact solves, a mix score no worse than before, the mix in words', () => {
    const r = balance([customersFile, '--feeder', feederFile, '--objective', 'mix', '--weights', 'neutral=1,unbalance=1,losses=2,voltage=1', '--max-moves', '3', '--json']);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.objective).toBe('mix');
    expect(j.moves.length).toBeLessThanOrEqual(3);
    const before = figuresOf(currentAssignment(customers));
    const after = figuresOf(j.assignment);
    expect(j.before.neutralCurrentA).toBeCloseTo(before.neutralCurrentA, 9);
    expect(j.after.lossesKw).toBeCloseTo(after.lossesKw, 9);
    expect(j.after.maxUnbalancePercent.iec).toBeCloseTo(after.maxUnbalancePercent.iec, 9);
    expect(j.after.minCustomerVoltagePu).toBeCloseTo(after.minCustomerVoltagePu, 9);
    // the engine's own score of the mix, each term relative to its value before (default definition iec)
    const spec: ObjectiveSpec = { objective: 'mix', weights: { neutral: 1, unbalance: 1, losses: 2, voltage: 1 } };
    const norm = mixNormalisers(before, spec);
    expect(balanceScore(after, spec, norm)).toBeLessThanOrEqual(balanceScore(before, spec, norm) + 1e-9);
    const text = balance([customersFile, '--feeder', feederFile, '--objective', 'mix', '--weights', 'losses=2,neutral=1', '--definition', 'ieee']);
    expect(text.code, text.stderr).toBe(0);
    expect(text.stdout).toContain('minimise the weighted mix of the neutral current leaving bus S (weight 1) and the losses (weight 2), each relative to its value before balancing');
  });

  it('bad weights: exit 2 with a clear message', () => {
    const mix = (weights: string) => balance([customersFile, '--feeder', feederFile, '--objective', 'mix', '--weights', weights]);
    const cases: [ReturnType<typeof balance>, RegExp][] = [
      [mix('neutral=-1,losses=1'), /the neutral weight cannot be negative/],
      [mix('neutral=0,losses=0'), /give at least one weight above zero/],
      [mix('cost=1'), /"cost" is not a term of the mix/],
      [mix('losses=two'), /the losses weight must be a number \(got "two"\)/],
      [mix('losses'), /give losses a number, as in losses=1/],
      [mix('losses=1,losses=2'), /losses is given twice/],
      [balance([customersFile, '--feeder', feederFile, '--objective', 'mix']), /--objective mix needs --weights/],
      [balance([customersFile, '--feeder', feederFile, '--objective', 'losses', '--weights', 'losses=1']), /--weights goes with --objective mix/],
    ];
    for (const [r, message] of cases) {
      expect(r.code, r.stderr).toBe(2);
      expect(r.stderr).toMatch(message);
      expect(r.stderr).not.toMatch(/at .*\.(ts|cjs|mjs):\d+/);
    }
  });

  it('bad input: exit 2 with a clear message', () => {
    const cases: [string[], RegExp][] = [
      [[customersFile], /give the feeder circuit file with --feeder/],
      [[customersFile, '--feeder', feederFile, '--objective', 'cost'], /--objective must be neutral, unbalance, losses, voltage or mix/],
      [[customersFile, '--feeder', feederFile, '--max-moves', '-1'], /--max-moves must be a whole number/],
      [[customersFile, '--feeder', feederFile, '--definition', 'iec'], /--definition goes with --objective unbalance or mix/],
      [[customersFile, '--feeder', feederFile, '--colour'], /unknown option --colour/],
      [[path.join(dir, 'none.csv'), '--feeder', feederFile], /cannot read .*none\.csv: ENOENT/],
      [[customersFile, '--feeder', file('bad.json', '{ no')], /bad\.json is not valid JSON/],
      [[customersFile, '--feeder', file('invalid.json', JSON.stringify({ ...smallFeeder, elements: [{ type: 'line', id: 'X' }] }))], /invalid\.json: /],
      [[file('rows.csv', 'customer,bus,phase,kw,kvar\nH1,P1,A,2,0\nH2,P1,E,x,0\n'), '--feeder', feederFile], /row 3, column phase: the phase must be A, B or C/],
      [[file('bus.csv', 'customer,bus,phase,kw,kvar\nH1,P7,A,2,0\n'), '--feeder', feederFile], /row 2, column bus: the feeder has no three-phase bus "P7"/],
      [[customersFile, '--feeder', feederFile, '--bus', 'Q4'], /the feeder has no bus "Q4"/],
    ];
    for (const [args, message] of cases) {
      const r = balance(args);
      expect(r.code, args.join(' ')).toBe(2);
      expect(r.stderr, args.join(' ')).toMatch(message);
      expect(r.stderr).not.toMatch(/at .*\.(ts|cjs|mjs):\d+/); // no stack trace
    }
  });
});
