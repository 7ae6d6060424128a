/**
 * The results of a primitive-only circuit, limited to what the CLI prints with `--json` (no
 * `--full`): node voltages, each element's solver currents, totals, floating parts, flags.
 *
 * Why: on a big primitive-only file (42 000 impedances) the full results build a result object,
 * a phasor per current and per power for every element, and the per-bus results, most of which
 * `--json` never prints; that cost as much as the solve. Here the voltages and currents stay in
 * the solver's typed arrays (solutionArrays: not even the solution's Maps are built; the printer
 * turns them into phasors as it writes) and the only per-element work is the power sum for the
 * totals. Every number comes from the same functions as buildResults (primitivePowers,
 * TotalsSum, busResults, computeFlags), added in the same order, so the printed values are the
 * same to the last bit (tests/server/cli/printed-json.test.ts).
 */
import type { Cx, FloatingIsland, PrimitiveSolution } from '../types.ts';
import { ZERO } from '../phasor.ts';
import type { PreparedCircuit } from '../solve-circuit.ts';
import { resolveLimits } from '../limits/limit-sets.ts';
import type { LimitsInput } from '../schema/circuit.ts';
import { computeFlags } from '../limits/flags.ts';
import { solutionArrays } from '../solver/network.ts';
import { busResults, lowVoltageLoadBranches, primitivePowers, resultConventions, TotalsSum } from './build-results.ts';
import type { CircuitResult, Flag } from './types.ts';

/** What `--json` prints of a primitive-only circuit: numbers in the solver's arrays, element data in parallel arrays in file order. */
export interface PrintedPrimitiveResult {
  conventions: CircuitResult['conventions'];
  /** Node names and voltages to earth (re, im), in the solver's order (as `CircuitResult.nodes`). */
  nodeNames: readonly string[];
  vRe: Float64Array;
  vIm: Float64Array;
  elementIds: string[];
  elementTypes: string[];
  /** The solver's currents of element k are cRe/cIm[currentStart[k] …] (currentCount[k] of them; 0 when it has none, as in the full results). */
  currentStart: Int32Array;
  currentCount: Int32Array;
  cRe: Float64Array;
  cIm: Float64Array;
  totals: CircuitResult['totals'];
  floating: FloatingIsland[];
  flags: Flag[];
  iterations: number;
}

/** True when every element of the circuit is a primitive (no building block, so no ports and no faults). */
export function isPrimitiveOnly(prepared: PreparedCircuit): boolean {
  return prepared.expansions.every((e) => e.ports === undefined && e.primitives.length === 1 && e.meta === undefined);
}

/**
 * The printed part of the results of a primitive-only circuit (see isPrimitiveOnly) solved by
 * solvePrimitives as `sol`; options as circuitResults. Undefined for a solution that did not come
 * from the solver (no arrays behind it).
 */
export function printedPrimitiveResults(prepared: PreparedCircuit, sol: PrimitiveSolution, options: { limits?: LimitsInput } = {}): PrintedPrimitiveResult | undefined {
  const arrays = solutionArrays(sol);
  if (!arrays) return undefined;
  const { nodeNames, nodeIndex, vRe, vIm, elementIds: primIds, currentOffset, cRe, cIm } = arrays;
  const { circuit, context, expansions } = prepared;
  const V = (name: string): Cx => {
    const i = nodeIndex.get(name);
    return i === undefined ? ZERO : { re: vRe[i], im: vIm[i] };
  };
  // the solver's index of each element's primitive: the same position when the lists line up
  let byId: Map<string, number> | undefined;
  const primIndex = (k: number, id: string): number => {
    if (primIds[k] === id) return k;
    if (!byId) byId = new Map(primIds.map((x, j) => [x, j]));
    return byId.get(id) ?? -1;
  };
  const n = expansions.length;
  const elementIds = new Array<string>(n);
  const elementTypes = new Array<string>(n);
  const currentStart = new Int32Array(n);
  const currentCount = new Int32Array(n);
  const totals = new TotalsSum();
  for (let k = 0; k < n; k++) {
    const e = expansions[k];
    const prim = e.primitives[0].prim;
    const j = primIndex(k, prim.id);
    const start = j < 0 ? 0 : currentOffset[j];
    const count = j < 0 ? 0 : currentOffset[j + 1] - start;
    const I = new Array<Cx>(count);
    for (let c = 0; c < count; c++) I[c] = { re: cRe[start + c], im: cIm[start + c] };
    elementIds[k] = e.id;
    elementTypes[k] = e.type;
    currentStart[k] = start;
    currentCount[k] = count;
    totals.add(e.category, primitivePowers(prim, I, V, e.category === 'source'));
  }
  const limits = resolveLimits(circuit.limits, options.limits);
  // The per-bus results are built only for the flags (voltage bands, unbalance, neutral shift).
  // Element flags come only from transformer loading, which no primitive has: none to pass.
  const floatingNodes = new Set(sol.floating.flatMap((f) => f.nodes));
  const nodeVolts = {
    keys: () => nodeNames,
    get: (name: string): Cx | undefined => {
      const i = nodeIndex.get(name);
      return i === undefined ? undefined : { re: vRe[i], im: vIm[i] };
    },
  };
  const buses = busResults(context, expansions, { nodeVolts }, floatingNodes, true);
  return {
    conventions: resultConventions(context.sequence),
    nodeNames,
    vRe,
    vIm,
    elementIds,
    elementTypes,
    currentStart,
    currentCount,
    cRe,
    cIm,
    totals: totals.result(sol.maxKclResidualAmps),
    floating: sol.floating,
    flags: computeFlags(buses, [], sol.floating, limits, lowVoltageLoadBranches(expansions, sol)),
    iterations: sol.iterations,
  };
}
