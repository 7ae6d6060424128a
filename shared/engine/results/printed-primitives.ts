/**
 * The results of a primitive-only circuit, limited to what the CLI prints with `--json` (no
 * `--full`): node voltages, each element's solver currents, totals, floating parts, flags.
 *
 * Why: on a big primitive-only file (42 000 impedances) the full results build a result object,
 * a phasor per current and per power for every element, and the per-bus results, most of which
 * `--json` never prints; that cost as much as the solve. Here the currents stay the solver's
 * complex numbers (the printer turns them into phasors as it writes) and the only per-element
 * work is the power sum for the totals. Every number comes from the same functions as
 * buildResults (primitivePowers, TotalsSum, busResults, computeFlags), added in the same order,
 * so the printed values are the same to the last bit (tests/server/cli/printed-json.test.ts).
 */
import type { Cx, FloatingIsland, PrimitiveSolution } from '../types.ts';
import { ZERO } from '../phasor.ts';
import type { PreparedCircuit } from '../solve-circuit.ts';
import { resolveLimits } from '../limits/limit-sets.ts';
import type { LimitsInput } from '../schema/circuit.ts';
import { computeFlags } from '../limits/flags.ts';
import { busResults, lowVoltageLoadBranches, primitivePowers, resultConventions, TotalsSum } from './build-results.ts';
import type { CircuitResult, Flag } from './types.ts';

/** What `--json` prints of a primitive-only circuit; element data in parallel arrays, in file order. */
export interface PrintedPrimitiveResult {
  conventions: CircuitResult['conventions'];
  /** Node voltages to earth, in the solver's order (as `CircuitResult.nodes`). */
  nodeVolts: ReadonlyMap<string, Cx>;
  elementIds: string[];
  elementTypes: string[];
  /** The solver's currents of each element (empty when it has none, as in the full results). */
  elementCurrents: (readonly Cx[])[];
  totals: CircuitResult['totals'];
  floating: FloatingIsland[];
  flags: Flag[];
  iterations: number;
}

/** True when every element of the circuit is a primitive (no building block, so no ports and no faults). */
export function isPrimitiveOnly(prepared: PreparedCircuit): boolean {
  return prepared.expansions.every((e) => e.ports === undefined && e.primitives.length === 1 && e.meta === undefined);
}

/** The printed part of the results of a primitive-only circuit (see isPrimitiveOnly); options as circuitResults. */
export function printedPrimitiveResults(prepared: PreparedCircuit, sol: PrimitiveSolution, options: { limits?: LimitsInput } = {}): PrintedPrimitiveResult {
  const { circuit, context, expansions } = prepared;
  const V = (n: string): Cx => sol.nodeVolts.get(n) ?? ZERO;
  const n = expansions.length;
  const elementIds = new Array<string>(n);
  const elementTypes = new Array<string>(n);
  const elementCurrents = new Array<readonly Cx[]>(n);
  const totals = new TotalsSum();
  for (let k = 0; k < n; k++) {
    const e = expansions[k];
    const prim = e.primitives[0].prim;
    const I = sol.elementCurrents.get(prim.id) ?? [];
    elementIds[k] = e.id;
    elementTypes[k] = e.type;
    elementCurrents[k] = I;
    totals.add(e.category, primitivePowers(prim, I, V, e.category === 'source'));
  }
  const limits = resolveLimits(circuit.limits, options.limits);
  // The per-bus results are built only for the flags (voltage bands, unbalance, neutral shift).
  // Element flags come only from transformer loading, which no primitive has: none to pass.
  const floatingNodes = new Set(sol.floating.flatMap((f) => f.nodes));
  const buses = busResults(context, expansions, sol, floatingNodes);
  return {
    conventions: resultConventions(context.sequence),
    nodeVolts: sol.nodeVolts,
    elementIds,
    elementTypes,
    elementCurrents,
    totals: totals.result(sol.maxKclResidualAmps),
    floating: sol.floating,
    flags: computeFlags(buses, [], sol.floating, limits, lowVoltageLoadBranches(expansions, sol)),
    iterations: sol.iterations,
  };
}
