/**
 * Unbalance per bus, every definition with its own limit and verdict: IEC |V2|/|V1|, NEMA
 * line-voltage and IEEE phase-voltage. A bus is "within" only when every definition is: a lost
 * neutral can leave the line voltages balanced (NEMA well within) while the phase voltages are
 * far apart (IEEE far over).
 */
import { UNBALANCE_METRICS, UNBALANCE_NAMES as SHORT, unbalanceOf, type BusResult, type CircuitResult, type UnbalanceMetric } from '../../../../shared/engine/index.ts';

interface Row {
  bus: string;
  values: { metric: UnbalanceMetric; value: number; limit: number; over: boolean }[];
  over: boolean;
  /** Largest value over its own limit, as a ratio (for ordering). */
  worst: number;
}

/** Rows for every three-phase bus with unbalance figures. */
export function unbalanceRows(result: CircuitResult): Row[] {
  const rows: Row[] = [];
  const order = [result.limits.unbalanceMetric, ...UNBALANCE_METRICS.filter((m) => m !== result.limits.unbalanceMetric)];
  for (const b of result.buses as BusResult[]) {
    const values = order
      .map((metric) => ({ metric, value: unbalanceOf(b, metric), limit: result.limits.unbalanceLimits?.[metric] ?? result.limits.unbalancePercent }))
      .filter((v): v is { metric: UnbalanceMetric; value: number; limit: number } => v.value !== undefined)
      .map((v) => ({ ...v, over: !(v.value <= v.limit) }));
    if (values.length === 0) continue;
    rows.push({ bus: b.bus, values, over: values.some((v) => v.over), worst: Math.max(...values.map((v) => (v.limit > 0 ? v.value / v.limit : Infinity))) });
  }
  return rows;
}

const pct = (x: number) => (Number.isFinite(x) ? `${x.toFixed(2)} %` : '∞ %');

function BusLine({ row }: { row: Row }) {
  return (
    <li className="num">
      <strong>{row.bus}</strong>:{' '}
      {row.over ? (
        <span className="font-semibold text-caution">
          <span aria-hidden="true">▲ </span>out of limits
        </span>
      ) : (
        <span className="text-ok">
          <span aria-hidden="true">✓ </span>within every limit
        </span>
      )}{' '}
      —{' '}
      {row.values.map((v, i) => (
        <span key={v.metric}>
          {i > 0 ? '; ' : ''}
          {SHORT[v.metric]} {pct(v.value)}{' '}
          {v.over ? <span className="font-semibold text-caution">over {v.limit} %</span> : <span className="text-ok">within {v.limit} %</span>}
        </span>
      ))}
    </li>
  );
}

/** Every bus on a small study; on a large one the buses out of limits and a count of the rest. */
export function UnbalanceSummary({ result }: { result: CircuitResult }) {
  const rows = unbalanceRows(result);
  if (rows.length === 0) return null;
  const small = rows.length <= 8;
  const out = rows.filter((r) => r.over);
  const within = rows.filter((r) => !r.over);
  const shown = small ? rows : out;
  const worstWithin = within.reduce<Row | undefined>((w, r) => (!w || r.worst > w.worst ? r : w), undefined);
  return (
    <div className="mt-1 text-[12px]">
      <ul aria-label="Unbalance against the limits">
        {shown.map((r) => (
          <BusLine key={r.bus} row={r} />
        ))}
      </ul>
      {!small && within.length > 0 ? (
        <p className="text-ok">
          {within.length} of {rows.length} buses within every unbalance limit{worstWithin ? ` (closest to a limit: ${worstWithin.bus})` : ''}.
        </p>
      ) : null}
    </div>
  );
}
