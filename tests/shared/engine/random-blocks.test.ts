/**
 * Random block circuits (./random-circuit.ts): every solve must satisfy KCL, power balance and
 * rotation invariance (solveChecked), and the results must be finite.
 * More seeds: RANDOM_BLOCK_SEEDS=300 (some deep-sag cases with constant-power loads then stop
 * with a NonConvergenceError from the solver's iteration).
 */
import { describe, expect, it } from 'vitest';
import { randomCircuit } from './random-circuit.ts';
import { solveChecked } from './solve-checked.ts';

describe('random block circuits', () => {
  for (let seed = 1; seed <= Number(process.env.RANDOM_BLOCK_SEEDS ?? 30); seed++) {
    it(`seed ${seed}: invariants hold and every result is finite`, () => {
      const res = solveChecked(randomCircuit(seed));
      for (const b of res.buses) for (const v of Object.values(b.toEarth)) expect(Number.isFinite(v.mag)).toBe(true);
      for (const e of Object.values(res.elements)) for (const c of e.currents) expect(Number.isFinite(c.mag)).toBe(true);
      const tx = res.elements.TX;
      expect(tx.loadingPercent!).toBeGreaterThan(0);
    });
  }
});
