/**
 * A finished (or partial) sweep as CSV: a first line with the safety caution, a header naming each
 * parameter and output with its unit, then one row per point (the parameter values, each output,
 * and a status column: "ok", "not run" or why the point could not be solved). CRLF line ends and
 * fields with a comma, quote or line break quoted, as every other CSV export of the product
 * (shared/report/csv.ts, RFC 4180). Pure.
 */
import type { PointRow } from './sweep-protocol.ts';
import type { SweepOutput } from '../../../../shared/review/sweep-outputs.ts';

export const CSV_CAUTION =
  '# Caution: Wyeward is an engineering aid; these results are only as good as the model. Follow local codes and licensed practice. A lost neutral puts dangerous voltages on equipment.';

const cell = (s: string) => (/[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s);
const num = (v: number | null | undefined) => (v === null || v === undefined || !Number.isFinite(v) ? '' : String(Number(v.toPrecision(10))));

export function sweepCsv(parameters: readonly string[], outputs: readonly Pick<SweepOutput, 'label' | 'unit'>[], points: readonly number[][], rows: readonly (PointRow | undefined)[]): string {
  const header = [...parameters, ...outputs.map((o) => `${o.label} (${o.unit})`), 'status'].map(cell).join(',');
  const lines = points.map((p, i) => {
    const r = rows[i];
    const status = !r ? 'not run' : r.error ? `does not solve: ${r.error}` : 'ok';
    return [...p.map(num), ...outputs.map((_, k) => num(r?.outputs[k])), cell(status)].join(',');
  });
  return [CSV_CAUTION, header, ...lines].join('\r\n') + '\r\n';
}
