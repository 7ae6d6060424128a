/** Formatting of result quantities for the review pages (diff values arrive in words from shared/review). */

/** A result value with its unit: 1 decimal at 100 or more, else 2 ("83.3 A" from 83.3; "4.27 %"). Null → "—". */
export function formatQuantity(x: number | null | undefined, unit: string): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—';
  const digits = Math.abs(x) >= 100 ? 1 : 2;
  return `${x.toFixed(digits)} ${unit}`;
}

/** A signed change with its unit ("+71.20 A", "−3.10 V"); a true minus sign so it reads as one. */
export function formatDelta(x: number | null | undefined, unit: string): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—';
  const digits = Math.abs(x) >= 100 ? 1 : 2;
  const body = Math.abs(x).toFixed(digits);
  if (Number(body) === 0) return `0 ${unit}`;
  return `${x > 0 ? '+' : '−'}${body} ${unit}`;
}
