/**
 * Per load: the voltage across each of its branches at its own terminals (V(from) − V(to), so a
 * single-phase load behind a broken neutral sees what it really sees, not the bus line-to-neutral
 * figure), in volts and per unit of the branch's rating (the load's `kvLL`/`ratedVolts`, else the
 * bus nominal), with its status against the limit set's voltage bands (the same bands as bus
 * voltages: ANSI C84.1 ranges or IEC/EN ±10 %, applied to the load's own rating).
 */
import type { Cx } from '../types.ts';
import { sub, toPhasor, ZERO } from '../phasor.ts';
import type { Expansion } from '../blocks/expansion.ts';
import type { LimitSet } from '../limits/limit-sets.ts';
import type { LoadBranchResult, LoadResult } from './types.ts';

/** Status of a per-unit voltage against the limit set's bands. */
export function voltageStatus(pu: number, limits: LimitSet): LoadBranchResult['status'] {
  const [vl, vh] = limits.voltageViolationPu;
  const [wl, wh] = limits.voltageWarningPu;
  if (pu > vh) return 'violation-high';
  if (pu < vl) return 'violation-low';
  if (pu > wh) return 'warning-high';
  if (pu < wl) return 'warning-low';
  return 'ok';
}

/** Terminal voltages of every load block. */
export function loadResults(expansions: readonly Expansion[], nodeVolts: ReadonlyMap<string, Cx>, limits: LimitSet): LoadResult[] {
  const V = (n: string): Cx => nodeVolts.get(n) ?? ZERO;
  const out: LoadResult[] = [];
  for (const e of expansions) {
    if (e.meta?.kind !== 'load') continue;
    const branches = e.meta.branches.map((b): LoadBranchResult => {
      const v = toPhasor(sub(V(b.fromNode), V(b.toNode)));
      const rated = b.ratedVolts !== undefined && b.ratedVolts > 0 ? b.ratedVolts : undefined;
      const pu = rated !== undefined ? v.mag / rated : undefined;
      return {
        branch: b.key,
        fromConductor: b.fromConductor,
        toConductor: b.toConductor,
        voltage: v,
        ...(rated !== undefined ? { ratedVolts: rated, ...(b.ratedFrom ? { ratedFrom: b.ratedFrom } : {}) } : {}),
        ...(pu !== undefined ? { pu } : {}),
        status: pu === undefined ? 'unrated' : voltageStatus(pu, limits),
      };
    });
    out.push({ id: e.id, bus: e.meta.bus, connection: e.meta.connection, branches });
  }
  return out;
}
