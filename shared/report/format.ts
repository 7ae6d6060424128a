/**
 * Numbers as every results view writes them (workspace tables, report, CSV): magnitudes with a
 * tenth above 10 then three or four significant figures, angles to a tenth of a degree with a true
 * minus sign, per-unit values to three decimals (three significant figures below 0.1). One source, so a PDF says exactly what the
 * screen and the CSV say.
 */

/** A magnitude with a tenth above 10 (141.6, 7199.6), then three or four significant figures (no exponent for the ranges a study sees). */
export function formatMagnitude(x: number): string {
  const a = Math.abs(x);
  if (!Number.isFinite(x)) return String(x);
  // Below a microvolt / microampere is rounding noise of the solve, not a value.
  if (a < 1e-6) return '0';
  if (a >= 100000) return x.toFixed(0);
  if (a >= 10) return x.toFixed(1);
  if (a >= 1) return x.toFixed(2);
  return x.toFixed(3);
}

/** An angle in degrees with one decimal, using a true minus sign ("−2.1°"); 0.0° for a zero phasor. */
export function formatAngle(deg: number): string {
  const r = Math.round(deg * 10) / 10;
  const v = Object.is(r, -0) || r === 0 ? 0 : r;
  return `${v < 0 ? '−' : ''}${Math.abs(v).toFixed(1)}°`;
}

/**
 * A per-unit value to three decimals ("1.394"); below 0.1, three significant figures ("0.00537"),
 * so a small but real value (a 5 kW load on a 1 MVA base, a 0.5 kvar flow) never reads as 0.000.
 */
export function formatPu(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  const a = Math.abs(x);
  if (a < 1e-6) return '0.000';
  if (a >= 0.1) return x.toFixed(3);
  return x.toFixed(2 - Math.floor(Math.log10(Number(a.toPrecision(3)))));
}

/** A percentage to two decimals ("47.30"). */
export function formatPercent(x: number): string {
  return Number.isFinite(x) ? x.toFixed(2) : String(x);
}
