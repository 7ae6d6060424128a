/**
 * Random block circuits (./random-circuit.ts): every solve must satisfy KCL, power balance and
 * rotation invariance (solveChecked), and the results must be finite.
 * 200 seeds by default (RANDOM_BLOCK_SEEDS=n for more: 1 500 pass). Deep sags with constant-power
 * loads are solved by Newton on the loads' terminal voltages (solver/zip-newton.ts); the chord
 * iteration used before stopped on some of them with a non-convergence error, although each had
 * a solution (the low-voltage rule makes one exist).
 */
import { describe, expect, it } from 'vitest';
import { randomCircuit } from './random-circuit.ts';
import { solveChecked } from './solve-checked.ts';

describe('random block circuits', () => {
  for (let seed = 1; seed <= Number(process.env.RANDOM_BLOCK_SEEDS ?? 200); seed++) {
    it(`seed ${seed}: invariants hold and every result is finite`, () => {
      const res = solveChecked(randomCircuit(seed));
      for (const b of res.buses) for (const v of Object.values(b.toEarth)) expect(Number.isFinite(v.mag)).toBe(true);
      for (const e of Object.values(res.elements)) for (const c of e.currents) expect(Number.isFinite(c.mag)).toBe(true);
      const tx = res.elements.TX;
      expect(tx.loadingPercent!).toBeGreaterThan(0);
    });
  }
});
