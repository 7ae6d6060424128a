/**
 * Phase-balancing benchmark: an invented 230/400 V feeder of 20 buses (a main cable of 14 pillars
 * and two spurs of 3) with 200 single-phase customers (seeded kW 0.2–1.8, pf 0.95–0.99, 55 % of
 * them drifted onto phase A), at most 10 moves, for each objective. Prints per objective the wall
 * time of the whole optimisation in this Node process (HiGHS loaded beforehand), split into
 * exact solve, linearisation, MILP and local search, the exact solves spent, the gap the MILP
 * proved and the figures before/after (after one untimed warm-up run); `uptime` before and after.
 * Asserts nothing. Settings: one
 * linearisation, HiGHS 2 s, 40 exact solves for the local search (BALANCE_FAST=0: the library's
 * defaults, as the CLI runs). HiGHS's limit is wall-clock time, so on a loaded machine the MILP
 * may stop earlier in its search (status time-limit) and prove a wider gap.
 * Run: `npm run -s bench:balance` (`BALANCE_OBJECTIVES=neutral,losses` to choose).
 */
import { execSync } from 'node:child_process';
import { balancePhases, type BalanceProgress, type CircuitInput, type Customer, type ObjectiveSpec } from '../../shared/engine/index.ts';
import { highsRuntime } from '../../server/work/highs.ts';

/** Seeded uniform numbers in [0, 1) (mulberry32). */
function random(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const CABLE = { kind: 'sequence' as const, z1PerLength: { re: 0.21, im: 0.07 }, z0PerLength: { re: 0.84, im: 0.28 }, neutralOhmsPerLength: { re: 0.21, im: 0.07 } };

/** The benchmark feeder and customers. */
export function benchFeeder(seed = 11): { feeder: CircuitInput; customers: Customer[] } {
  const rnd = random(seed);
  const elements: CircuitInput['elements'] = [{ type: 'source', id: 'BOARD', bus: 'M0', kvLL: 0.4, impedance: { z1: { re: 0.003, im: 0.012 }, z0: { re: 0.003, im: 0.012 } } }];
  const line = (id: string, from: string, to: string, m: number) => elements.push({ type: 'line', id, from, to, length: m, lengthUnit: 'm', perLengthUnit: 'km', impedance: CABLE });
  const buses: string[] = [];
  for (let k = 1; k <= 14; k++) (line(`M${k}`, `M${k - 1}`, `M${k}`, 25 + 10 * rnd()), buses.push(`M${k}`));
  for (const [spur, at] of [['S', 'M4'], ['T', 'M9']] as const)
    for (let k = 1; k <= 3; k++) (line(`${spur}${k}`, k === 1 ? at : `${spur}${k - 1}`, `${spur}${k}`, 25 + 10 * rnd()), buses.push(`${spur}${k}`));
  const customers: Customer[] = [];
  for (let i = 0; i < 200; i++) {
    const kw = 0.2 + 1.6 * rnd() ** 2;
    const pf = 0.95 + 0.04 * rnd();
    const u = rnd();
    customers.push({ customer: `C${i + 1}`, bus: buses[i % buses.length], phase: u < 0.55 ? 'A' : u < 0.8 ? 'B' : 'C', kw: Number(kw.toFixed(2)), kvar: Number((kw * Math.tan(Math.acos(pf))).toFixed(3)), fixed: false, model: 'p', allowed: ['A', 'B', 'C'] });
  }
  return { feeder: { format: 'wyeward-circuit', version: 1, frequencyHz: 50, name: 'Balancing benchmark feeder', elements }, customers };
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const { feeder, customers } = benchFeeder();
  const highs = await highsRuntime();
  const wanted = (process.env.BALANCE_OBJECTIVES ?? 'neutral,unbalance,losses,voltage').split(',');
  const specs: ObjectiveSpec[] = wanted.map((o) => ({ objective: o as ObjectiveSpec['objective'] }));
  // warm-up (not timed): one small run so that the first objective does not pay for compilation
  balancePhases(highs, feeder, customers.slice(0, 30), { objective: { objective: 'neutral' }, maxMoves: 1, milpTimeLimitS: 0.5, relinearise: 1, maxEvaluations: 2 });
  console.log(`uptime before: ${execSync('uptime').toString().trim()}`);
  console.log(`workload: 20 buses, 200 customers (${customers.filter((c) => c.phase === 'A').length} on A), max 10 moves; ${process.env.BALANCE_FAST === '0' ? 'library defaults' : 'one linearisation, HiGHS ≤ 2 s, ≤ 40 local-search solves'}; node ${process.version}`);
  console.log('| objective | total | solve+rotating | linearise | MILP | local search | exact solves | MILP gap | MILP status | score before → after (rotating rule) | moves |');
  console.log('|---|---|---|---|---|---|---|---|---|---|---|');
  for (const spec of specs) {
    const marks: Partial<Record<BalanceProgress['stage'], number>> = {};
    const stageTime: Record<string, number> = {};
    let last = performance.now();
    let lastStage = 'solving';
    const t0 = last;
    const r = balancePhases(highs, feeder, customers, {
      objective: spec,
      maxMoves: 10,
      ...(process.env.BALANCE_FAST === '0' ? {} : { milpTimeLimitS: 2, relinearise: 1, maxEvaluations: 40 }),
      onProgress: (p) => {
        const now = performance.now();
        if (p.stage !== lastStage) {
          stageTime[lastStage] = (stageTime[lastStage] ?? 0) + now - last;
          last = now;
          lastStage = p.stage;
        }
        marks[p.stage] ??= now;
      },
    });
    const total = performance.now() - t0;
    const s = (k: string) => `${((stageTime[k] ?? 0) / 1000).toFixed(2)} s`;
    console.log(`| ${spec.objective} | ${(total / 1000).toFixed(2)} s | ${s('solving')} | ${s('linearising')} | ${s('milp')} | ${s('local-search')} | ${r.solves} | ${Number.isFinite(r.gapPercent) ? `${r.gapPercent.toFixed(2)} %` : 'none'} | ${r.milp.status} | ${r.scores.before.toPrecision(4)} → ${r.scores.after.toPrecision(4)} (${r.scores.rotatingRule.toPrecision(4)}) | ${r.moves.length} |`);
  }
  console.log(`uptime after: ${execSync('uptime').toString().trim()}`);
}
