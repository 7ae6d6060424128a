/**
 * Limit sets resolved from a circuit file's settings (the sets themselves, with their sources, are
 * in ./limit-values.ts, which needs no schema).
 */
import type { LimitsInput } from '../schema/circuit.ts';
import { limitsSchema } from '../schema/circuit.ts';
import { InvalidCircuitError } from '../errors.ts';
import { ANSI_C84_1, IEC_EN, type LimitSet, type UnbalanceMetric } from './limit-values.ts';

export { UNBALANCE_METRICS, ANSI_C84_1, IEC_EN, type UnbalanceMetric, type LimitSet } from './limit-values.ts';

/** Resolve a named set plus overrides (circuit file settings first, then call options). */
export function resolveLimits(...layers: (LimitsInput | undefined)[]): LimitSet {
  let out: LimitSet = ANSI_C84_1;
  for (const layer of layers) {
    if (!layer) continue;
    const parsed = limitsSchema.safeParse(layer);
    if (!parsed.success) throw new InvalidCircuitError(`invalid limits: ${parsed.error.issues[0].message}`, parsed.error.issues.map((i) => ({ path: `limits.${i.path.join('.')}`, message: i.message })));
    const l = parsed.data;
    const base = layer.set !== undefined ? (l.set === 'iec-en' ? IEC_EN : ANSI_C84_1) : out;
    const unbalancePercent = l.unbalancePercent ?? base.unbalancePercent;
    const sameFigure = l.unbalancePercent !== undefined ? { iec: unbalancePercent, nema: unbalancePercent, ieee: unbalancePercent } : base.unbalanceLimits;
    const unbalanceLimits = { ...sameFigure, ...Object.fromEntries(Object.entries(l.unbalancePercentByMetric ?? {}).filter(([, v]) => v !== undefined)) } as Record<UnbalanceMetric, number>;
    out = {
      ...base,
      unbalanceLimits,
      ...(l.voltageWarningPu ? { voltageWarningPu: l.voltageWarningPu } : {}),
      ...(l.voltageViolationPu ? { voltageViolationPu: l.voltageViolationPu } : {}),
      ...(l.unbalanceMetric ? { unbalanceMetric: l.unbalanceMetric } : {}),
      unbalancePercent: unbalanceLimits[l.unbalanceMetric ?? base.unbalanceMetric],
      ...(l.neutralShiftPercent !== undefined ? { neutralShiftPercent: l.neutralShiftPercent } : {}),
      ...(l.loadingPercent !== undefined ? { loadingPercent: l.loadingPercent } : {}),
    };
  }
  return out;
}
