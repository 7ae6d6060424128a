/**
 * Newton and continuation on the loads' terminal voltages (shared/engine/solver/zip-newton.ts),
 * on the reduced problem of one constant-power load P behind a resistance R from an EMF E, whose
 * closed forms are known (C): V² − E·V + P·R = 0, nose (loadability limit) at P·λ* = E²/(4R)
 * with V = E/2 there.
 */
import { describe, expect, it } from 'vitest';
import { zipContinuation, zipNewton, type ZipReduced } from '../../../../shared/engine/solver/zip-newton.ts';

const E = 230;
const R = 1;

/** The reduced problem: M = 1/R + y0, u⁰ = (E/R)/M, G = 1/M; law I = P/conj(u) (no low-voltage rule). */
function onePowerLoad(P: number): ZipReduced {
  const y0 = P / (E * E);
  const M = 1 / R + y0;
  return {
    m: 1,
    u0Re: Float64Array.of(E / R / M),
    u0Im: Float64Array.of(0),
    gRe: Float64Array.of(1 / M),
    gIm: Float64Array.of(0),
    vRated: Float64Array.of(E),
    law: (_a, ur, ui, out) => {
      // I = P·u/|u|², ∂I from the quotient rule
      const m2 = ur * ur + ui * ui;
      out[0] = (P * ur) / m2;
      out[1] = (P * ui) / m2;
      out[2] = (P * (m2 - 2 * ur * ur)) / (m2 * m2);
      out[3] = (-2 * P * ur * ui) / (m2 * m2);
      out[4] = (-2 * P * ur * ui) / (m2 * m2);
      out[5] = (P * (m2 - 2 * ui * ui)) / (m2 * m2);
      out[6] = y0;
      out[7] = 0;
    },
  };
}

describe('zip-load Newton and continuation', () => {
  it('Newton converges to the upper root below the nose', () => {
    const p = onePowerLoad(10000);
    const u = Float64Array.from(p.u0Re);
    const ui = new Float64Array(1);
    const r = zipNewton(p, u, ui, 1, 'blend', 1e-12, 50);
    expect(r.status).toBe('converged');
    expect(u[0]).toBeCloseTo((E + Math.sqrt(E * E - 4 * 10000 * R)) / 2, 8);
    expect(Math.abs(ui[0])).toBeLessThan(1e-8);
  });

  it('beyond the nose there is no solution and the load-level continuation stops at λ* = E²/(4RP)', () => {
    const P = 20000;
    const p = onePowerLoad(P);
    const u = Float64Array.from(p.u0Re);
    expect(zipNewton(p, u, new Float64Array(1), 1, 'blend', 1e-10, 50).status).not.toBe('converged');
    const c = zipContinuation(p, 'level', 1e-10);
    const nose = (E * E) / (4 * R * P);
    expect(c.lambda).toBeLessThanOrEqual(nose);
    expect(c.lambda).toBeGreaterThan(nose * (1 - 1e-3));
    // at the nose the voltage approaches E/2 (the fold is steep in V: within a few per cent)
    expect(Math.hypot(c.uRe[0], c.uIm[0]) / (E / 2)).toBeCloseTo(1, 1);
  });

  it('the blend continuation reaches the solution below the nose', () => {
    const p = onePowerLoad(13000);
    const c = zipContinuation(p, 'blend', 1e-12);
    expect(c.lambda).toBe(1);
    expect(c.uRe[0]).toBeCloseTo((E + Math.sqrt(E * E - 4 * 13000 * R)) / 2, 7);
  });
});
