/** Number formatting of the results: RMS magnitude∠degrees, powers in kW/kvar/kVA, always with units. */
import type { Phasor } from '../../../../shared/engine/index.ts';

import { formatAngle, formatMagnitude } from '../../../../shared/report/format.ts';

// The same numbers as the report and the CSV (shared/report/format.ts).
export { formatAngle, formatMagnitude };

/** An axis tick: the shortest exact form of a round number (50, 2.5, 0.25, 8000). */
export function formatTick(x: number): string {
  return String(Number(x.toPrecision(6)));
}

/** RMS magnitude∠degrees with a unit: "141.6 V∠−2.1°". */
export function formatPhasor(p: Phasor | undefined, unit: string): string {
  if (!p) return '—';
  if (p.mag < 1e-6) return `0 ${unit}`;
  return `${formatMagnitude(p.mag)} ${unit}∠${formatAngle(p.angleDeg)}`;
}

/** A plain value with its unit: "47.3 %". */
export function formatValue(x: number | undefined, unit: string, digits?: number): string {
  if (x === undefined || !Number.isFinite(x)) return '—';
  return `${digits === undefined ? formatMagnitude(x) : x.toFixed(digits)} ${unit}`;
}

/** Power in kW (real part of S in VA). */
export const kW = (s: Phasor | undefined): string => formatValue(s ? s.re / 1000 : undefined, 'kW');
/** Reactive power in kvar (imaginary part of S in VA). */
export const kvar = (s: Phasor | undefined): string => formatValue(s ? s.im / 1000 : undefined, 'kvar');
/** Apparent power in kVA. */
export const kVA = (s: Phasor | undefined): string => formatValue(s ? s.mag / 1000 : undefined, 'kVA');

/** Power factor |P|/|S| with "lagging" when Q > 0 (load convention), "leading" when Q < 0. */
export function formatPowerFactor(s: Phasor | undefined): string {
  if (!s || s.mag === 0) return '—';
  const pf = Math.abs(s.re) / s.mag;
  const sense = Math.abs(s.im) < 1e-9 * s.mag ? '' : s.im > 0 ? ' lagging' : ' leading';
  return `${pf.toFixed(3)}${sense}`;
}
