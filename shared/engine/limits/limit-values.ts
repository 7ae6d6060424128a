/**
 * Limit sets the results are flagged against. Voltages in per unit of the bus nominal
 * (line-to-neutral where the bus has a neutral, line-to-line otherwise).
 * - ANSI C84.1 (default): service Range A 114–126 V and Range B 110–127 V on a 120 V base
 *   (ANSI C84.1 Table 1; M, the 114/126 V pair V via secondary copies), scaled to the bus nominal;
 *   outside Range A → warning, outside Range B → violation. Unbalance: at most 3 % line-voltage
 *   unbalance (ANSI C84.1 annex on voltage unbalance, which uses the max-deviation definition).
 * - IEC/EN: ±10 % of nominal (EN 50160 supply voltage variation; M) → violation; negative-sequence
 *   unbalance |V2|/|V1| within 2 % (EN 50160 (V); IEC 61000-2-2 compatibility level (M)).
 * Every unbalance definition (IEC |V2|/|V1|, NEMA line-voltage, IEEE phase-voltage) is checked
 * against its own limit (`unbalanceLimits`): the set's figure for each unless one is given per
 * definition (P: the set's one figure applied to each definition; no standard states a separate
 * phase-voltage figure). A bus is within only when every definition is.
 * Neutral shift (neutral-to-earth voltage above 10 % of nominal V_LN) and transformer loading
 * above 100 % are warnings in both sets (P: common practice, no standard number).
 * No schema here (the CLI's lean bundle flags with these without loading zod); files' own
 * settings are resolved by resolveLimits in ./limit-sets.ts.
 */

/** Unbalance definitions: IEC |V2|/|V1|, NEMA line-voltage, IEEE phase-voltage. */
export type UnbalanceMetric = 'iec' | 'nema' | 'ieee';
export const UNBALANCE_METRICS: readonly UnbalanceMetric[] = ['iec', 'nema', 'ieee'];

/** A resolved limit set. */
export interface LimitSet {
  id: 'ansi-c84.1' | 'iec-en';
  name: string;
  /** [low, high] pu: outside → warning. */
  voltageWarningPu: [number, number];
  /** [low, high] pu: outside → violation. */
  voltageViolationPu: [number, number];
  /** The definition the set is stated in, and its figure. */
  unbalanceMetric: UnbalanceMetric;
  unbalancePercent: number;
  /** The limit each unbalance definition is checked against, %. */
  unbalanceLimits: Record<UnbalanceMetric, number>;
  neutralShiftPercent: number;
  loadingPercent: number;
}

export const ANSI_C84_1: LimitSet = {
  id: 'ansi-c84.1',
  name: 'ANSI C84.1 service voltage (Range A warning, Range B violation), 3 % unbalance',
  voltageWarningPu: [114 / 120, 126 / 120],
  voltageViolationPu: [110 / 120, 127 / 120],
  unbalanceMetric: 'nema',
  unbalancePercent: 3,
  unbalanceLimits: { iec: 3, nema: 3, ieee: 3 },
  neutralShiftPercent: 10,
  loadingPercent: 100,
};

export const IEC_EN: LimitSet = {
  id: 'iec-en',
  name: 'IEC/EN: ±10 % of nominal, 2 % negative-sequence unbalance',
  voltageWarningPu: [0.9, 1.1],
  voltageViolationPu: [0.9, 1.1],
  unbalanceMetric: 'iec',
  unbalancePercent: 2,
  unbalanceLimits: { iec: 2, nema: 2, ieee: 2 },
  neutralShiftPercent: 10,
  loadingPercent: 100,
};
