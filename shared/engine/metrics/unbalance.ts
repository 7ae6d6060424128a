/**
 * Voltage-unbalance measures (definitions in docs/circuit-format.md, sources in the README checks table):
 * - IEC factor |V2|/|V1| × 100 % (IEC TR 61000-3-13; measured per IEC 61000-4-30);
 * - line-voltage unbalance (NEMA MG 1): max deviation of a line voltage from the average of the
 *   three, over that average, × 100 %;
 * - phase-voltage unbalance (IEEE, Pillay & Manyage 2001): the same on line-to-neutral magnitudes.
 */
import type { Cx } from '../types.ts';
import { abs } from '../phasor.ts';

/** IEC unbalance factor |V2|/|V1| in percent (Infinity when V1 = 0 and V2 ≠ 0, 0 when both are 0). */
export function iecUnbalancePercent(v1: Cx, v2: Cx): number {
  const m1 = abs(v1);
  const m2 = abs(v2);
  if (m1 === 0) return m2 === 0 ? 0 : Infinity;
  return (100 * m2) / m1;
}

/** Max deviation from the average over the average, in percent (NEMA on line voltages, IEEE on phase voltages). */
export function maxDeviationUnbalancePercent(magnitudes: readonly number[]): number {
  const avg = magnitudes.reduce((s, m) => s + m, 0) / magnitudes.length;
  if (avg === 0) return 0;
  return (100 * Math.max(...magnitudes.map((m) => Math.abs(m - avg)))) / avg;
}

/**
 * IEC unbalance factor from the three line-voltage magnitudes only (no angles needed):
 * β = Σ|V|⁴ / (Σ|V|²)², VUF = √((1 − √(3 − 6β)) / (1 + √(3 − 6β))) × 100 %
 * (the magnitudes-only form given with IEC 61000-4-30; exact for line voltages, which have no zero sequence).
 */
export function iecUnbalanceFromLineMagnitudesPercent(vab: number, vbc: number, vca: number): number {
  const s2 = vab ** 2 + vbc ** 2 + vca ** 2;
  const beta = (vab ** 4 + vbc ** 4 + vca ** 4) / (s2 * s2);
  const r = Math.sqrt(Math.max(0, 3 - 6 * beta));
  return 100 * Math.sqrt((1 - r) / (1 + r));
}
