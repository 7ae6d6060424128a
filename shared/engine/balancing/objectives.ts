/**
 * What the planner asks the balancing to minimise. Each objective is a score, lower is better:
 * - `neutral`: neutral current at the measuring point, A;
 * - `unbalance`: worst voltage unbalance along the feeder by one definition (iec, nema or ieee), %;
 * - `losses`: total losses, kW;
 * - `voltage`: 1 − the lowest customer voltage in pu (raising the worst customer);
 * - `mix`: Σ weightₖ · scoreₖ / scoreₖ(before), over the objectives given a weight.
 */
import type { BalanceFigures } from './figures.ts';

export const BALANCE_OBJECTIVES = ['neutral', 'unbalance', 'losses', 'voltage', 'mix'] as const;
export type BalanceObjective = (typeof BALANCE_OBJECTIVES)[number];
export type UnbalanceDefinition = 'iec' | 'nema' | 'ieee';
export type SingleObjective = Exclude<BalanceObjective, 'mix'>;

export interface ObjectiveSpec {
  objective: BalanceObjective;
  /** Definition of unbalance used by `unbalance` (and by `mix`); default iec. */
  definition?: UnbalanceDefinition;
  /** Weights of `mix`. */
  weights?: Partial<Record<SingleObjective, number>>;
}

/** The score of one single objective (lower is better). */
export function singleScore(f: BalanceFigures, o: SingleObjective, definition: UnbalanceDefinition = 'iec'): number {
  switch (o) {
    case 'neutral':
      return f.neutralCurrentA;
    case 'unbalance':
      return f.maxUnbalancePercent[definition];
    case 'losses':
      return f.lossesKw;
    case 'voltage':
      return 1 - f.minCustomerVoltagePu;
  }
}

/** Normalisers of `mix`: each score before balancing (a zero one counts as 1). */
export function mixNormalisers(before: BalanceFigures, spec: ObjectiveSpec): Record<SingleObjective, number> {
  const n = (o: SingleObjective) => {
    const s = Math.abs(singleScore(before, o, spec.definition));
    return s > 1e-12 ? s : 1;
  };
  return { neutral: n('neutral'), unbalance: n('unbalance'), losses: n('losses'), voltage: n('voltage') };
}

/** The score of an objective (lower is better); `norm` is needed for `mix`. */
export function score(f: BalanceFigures, spec: ObjectiveSpec, norm?: Record<SingleObjective, number>): number {
  if (spec.objective !== 'mix') return singleScore(f, spec.objective, spec.definition);
  let s = 0;
  for (const [o, w] of Object.entries(spec.weights ?? {}) as [SingleObjective, number][]) if (w) s += (w * singleScore(f, o, spec.definition)) / (norm?.[o] ?? 1);
  return s;
}
