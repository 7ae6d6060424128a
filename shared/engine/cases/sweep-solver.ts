/**
 * Solving sweep points for their outputs: a sweep records a few numbers per point (a load's
 * terminal voltage in pu, a bus phase's voltage, the neutral shift, the IEC unbalance), so a point
 * builds only the results of the loads and buses it records, not the whole result set.
 *
 * What stays the same from point to point is done once per batch (and kept while the same circuit
 * object and parameters come back, as in a browser worker's chunks of one sweep): the circuit is
 * validated and expanded once, the limits resolved once. A point re-validates only the elements
 * its parameters change (the format validates element by element, so this finds what validating
 * the whole file would) and re-expands only those, swapping their primitives into the batch's list,
 * when the new expansion has the same shape as the batch's (same primitive ids, kinds, nodes,
 * roles and switch states: then the earth-bond merge, the id check and the switch-node check come
 * out as for the batch) and the changed elements do not set bus nominals (sources and transformers,
 * whose values every other element's expansion may read). Otherwise the point is prepared whole,
 * as before; where a changed element does not pass, through `prepareCircuit`, whose error names the
 * element and field. The solver's network (ordering, symbolic factor) is kept while the topology
 * stays, and is told which primitives changed. Pure: the browser's sweep workers and the server's
 * work threads both run it.
 */
import { EngineError } from '../errors.ts';
import type { Cx, PrimitiveSolution } from '../types.ts';
import { resolveLimits, type LimitSet } from '../limits/limit-sets.ts';
import type { BusResult, LoadResult } from '../results/types.ts';
import { busResults, splitBusNode } from '../results/build-results.ts';
import { loadResults } from '../results/load-results.ts';
import { elementSchemas, type Circuit, type CircuitInput, type ElementType } from '../schema/circuit.ts';
import { parseCircuit } from '../schema/parse-circuit.ts';
import { prepareCircuit, prepareParsedCircuit, type PreparedCircuit } from '../solve-circuit.ts';
import { expansionShape, primitivePositions, SETS_NOMINALS, swapExpanded, type PreparedChange } from '../prepare-changed.ts';
import { createNetwork, solutionArrays, type Network } from '../solver/index.ts';
import { resolveParameter } from './set-path.ts';
import { sweepCircuit } from './sweep-points.ts';

/** One number a sweep records per point. */
export type SweepOutputSpec =
  | { kind: 'load'; load: string; branch: string }
  | { kind: 'bus'; bus: string; conductor: string }
  | { kind: 'shift'; bus: string }
  | { kind: 'unbalance'; bus: string };

/** One solved point: the outputs in request order (null where the result has no such quantity), or the engine's objection. */
export interface SweepPointRow {
  outputs: (number | null)[];
  error?: string;
}

/** The value of one output in (bus and load) results: load pu, phase-to-neutral V, neutral-to-earth V, IEC unbalance %. */
export function sweepOutputValue(r: { buses: readonly BusResult[]; loads: readonly LoadResult[] }, s: SweepOutputSpec): number | null {
  if (s.kind === 'load') return r.loads.find((l) => l.id === s.load)?.branches.find((x) => x.branch === s.branch)?.pu ?? null;
  const bus = r.buses.find((b) => b.bus === s.bus);
  if (!bus) return null;
  if (s.kind === 'bus') return bus.lineToNeutral[s.conductor]?.mag ?? null;
  if (s.kind === 'shift') return bus.neutralToEarth?.mag ?? null;
  return bus.iecUnbalancePercent ?? null;
}

type Obj = Record<string, unknown>;

/** A point's circuit ready for the solver; `changed`: positions in `primitives` that differ from the batch's (undefined: any may). */
type PointCircuit = PreparedChange;

/** A batch: the circuit (validated and expanded once) and how a point's values become its circuit. */
interface Batch {
  raw: CircuitInput;
  pathsKey: string;
  limits: LimitSet | null;
  prepare: (values: readonly number[]) => PointCircuit;
}

function createBatch(raw: CircuitInput, paths: readonly string[]): Batch {
  const whole = (values: readonly number[]): PointCircuit => prepareCircuit(sweepCircuit(raw, paths, values));
  let base: PreparedCircuit;
  try {
    base = prepareParsedCircuit(parseCircuit(raw));
  } catch {
    return { raw, pathsKey: paths.join('\n'), limits: null, prepare: whole };
  }
  const rawEls = raw.elements as unknown as Obj[];
  const ids = [...new Set(paths.map((p) => resolveParameter(raw, p).elementId))];
  const at = ids.map((id) => rawEls.findIndex((e) => e.id === id));
  const own = { elements: at.map((i) => rawEls[i]) } as unknown as CircuitInput;
  // where each changed element's primitives sit in the batch's list (-1: merged into an earlier earth bond, not solved)
  const all = primitivePositions(base.expansions);
  const positions = new Map<number, number[]>(at.map((i) => [i, all[i]]));
  const shapes = at.map((i) => expansionShape(base.expansions[i]));
  const local = at.every((i) => !SETS_NOMINALS.has(base.circuit.elements[i].type));
  const limits = resolveLimits(base.circuit.limits);
  const prepare = (values: readonly number[]): PointCircuit => {
    const changed = sweepCircuit(own, paths, values).elements as unknown as Obj[];
    const elements = base.circuit.elements.slice();
    for (let k = 0; k < at.length; k++) {
      const parsed = elementSchemas[changed[k].type as ElementType].safeParse(changed[k]);
      if (!parsed.success) return whole(values);
      elements[at[k]] = parsed.data as Circuit['elements'][number];
    }
    const circuit: Circuit = { ...base.circuit, elements };
    if (!local) return prepareParsedCircuit(circuit);
    return swapExpanded(base, circuit, at, (i) => positions.get(i)!, (i) => shapes[at.indexOf(i)]) ?? prepareParsedCircuit(circuit);
  };
  return { raw, pathsKey: paths.join('\n'), limits, prepare };
}

/** Node voltages read straight from the solver's arrays (the solution's Map is built only when something asks it for every node). */
function voltsOf(sol: PrimitiveSolution): { get(node: string): Cx | undefined } {
  const a = solutionArrays(sol);
  if (!a) return sol.nodeVolts;
  return {
    get(node) {
      const i = a.nodeIndex.get(node);
      return i === undefined ? undefined : { re: a.vRe[i], im: a.vIm[i] };
    },
  };
}

/** Nodes of the recorded buses in a solution (cached per node numbering: the same while the topology stays). */
function busNodesOf(): (sol: PrimitiveSolution, buses: ReadonlySet<string>) => string[] {
  let names: readonly string[] | null = null;
  let nodes: string[] = [];
  return (sol, buses) => {
    const all = solutionArrays(sol)?.nodeNames ?? [...sol.nodeVolts.keys()];
    if (all !== names) {
      names = all;
      nodes = all.filter((n) => {
        const s = splitBusNode(n);
        return !!s && buses.has(s.bus);
      });
    }
    return nodes;
  };
}

/**
 * A stateful sweep solver: `(circuit, paths, points, outputs)` → one row per point. A point the
 * engine refuses is reported in its row (the message as the engine words it); a parameter path
 * that names no element is an InvalidCircuitError thrown for the whole batch. Calls with the same
 * circuit object and paths (chunks of one sweep) share the batch's validated, expanded circuit.
 */
export function createSweepSolver(): (circuit: CircuitInput, paths: readonly string[], points: readonly (readonly number[])[], outputs: readonly SweepOutputSpec[]) => SweepPointRow[] {
  let network: Network | null = null;
  let batch: Batch | null = null;
  let busNodes = busNodesOf();
  /** The batch whose swapped primitives the network holds (null: any other list). */
  let networkOf: Batch | null = null;
  return (circuit, paths, points, outputs) => {
    if (!batch || batch.raw !== circuit || batch.pathsKey !== paths.join('\n')) {
      batch = createBatch(circuit, paths);
      busNodes = busNodesOf();
    }
    const { prepare } = batch;
    const wantLoads = new Set(outputs.flatMap((o) => (o.kind === 'load' ? [o.load] : [])));
    const wantBuses = new Set(outputs.flatMap((o) => (o.kind === 'load' ? [] : [o.bus])));
    const current = batch;
    return points.map((values) => {
      try {
        const prepared = prepare(values);
        const limits = current.limits ?? resolveLimits(prepared.circuit.limits);
        // the network is told which primitives changed only when it holds this batch's others (the
        // last point was prepared by this batch's swap too: the same positions change at every point)
        if (network && prepared.changed && networkOf === current) network.update(prepared.primitives, prepared.changed);
        else if (network) network.update(prepared.primitives);
        else network = createNetwork(prepared.primitives);
        networkOf = prepared.changed ? current : null;
        const sol = network.solve();
        const volts = voltsOf(sol);
        let buses: BusResult[] = [];
        if (wantBuses.size) {
          const nodes = busNodes(sol, wantBuses);
          const floating = new Set(sol.floating.flatMap((f) => f.nodes));
          buses = busResults(prepared.context, [], { nodeVolts: { keys: () => nodes, get: (n) => volts.get(n) } }, floating);
        }
        const loads = wantLoads.size ? loadResults(prepared.expansions.filter((e) => wantLoads.has(e.id)), volts as ReadonlyMap<string, Cx>, limits) : [];
        return { outputs: outputs.map((o) => sweepOutputValue({ buses, loads }, o)) };
      } catch (e) {
        // a failed update may leave the cached network unusable: start afresh at the next point
        network = null;
        networkOf = null;
        const error = e instanceof EngineError ? e.message : `the solver stopped unexpectedly: ${(e as Error).message}`;
        return { outputs: outputs.map(() => null), error };
      }
    });
  };
}
