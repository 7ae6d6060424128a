/**
 * Solving sweep points for their outputs: a sweep records a few numbers per point (a load's
 * terminal voltage in pu, a bus phase's voltage, the neutral shift, the IEC unbalance), so a point
 * builds only the bus and load results, not the whole result set. The circuit is validated once
 * per batch of points; a point re-validates only the elements its parameters change (the format
 * validates element by element, so this finds what validating the whole file would), and where a
 * changed element does not pass, the point goes through `prepareCircuit`, whose error names the
 * element and field. The solver's network (ordering, symbolic factor) is kept while the topology
 * stays. Pure: the browser's sweep workers and the server's work threads both run it.
 */
import { EngineError } from '../errors.ts';
import { resolveLimits } from '../limits/limit-sets.ts';
import type { BusResult, LoadResult } from '../results/types.ts';
import { busResults } from '../results/build-results.ts';
import { loadResults } from '../results/load-results.ts';
import { elementSchemas, type Circuit, type CircuitInput, type ElementType } from '../schema/circuit.ts';
import { parseCircuit } from '../schema/parse-circuit.ts';
import { prepareCircuit, prepareParsedCircuit, type PreparedCircuit } from '../solve-circuit.ts';
import { createNetwork, type Network } from '../solver/index.ts';
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

function batchPreparer(raw: CircuitInput, paths: readonly string[]): (values: readonly number[]) => PreparedCircuit {
  let base: Circuit;
  try {
    base = parseCircuit(raw);
  } catch {
    return (values) => prepareCircuit(sweepCircuit(raw, paths, values));
  }
  const rawEls = raw.elements as unknown as Obj[];
  const ids = [...new Set(paths.map((p) => resolveParameter(raw, p).elementId))];
  const at = ids.map((id) => rawEls.findIndex((e) => e.id === id));
  const own = { elements: at.map((i) => rawEls[i]) } as unknown as CircuitInput;
  return (values) => {
    const changed = sweepCircuit(own, paths, values).elements as unknown as Obj[];
    const elements = base.elements.slice();
    for (let k = 0; k < at.length; k++) {
      const parsed = elementSchemas[changed[k].type as ElementType].safeParse(changed[k]);
      if (!parsed.success) return prepareCircuit(sweepCircuit(raw, paths, values));
      elements[at[k]] = parsed.data as Circuit['elements'][number];
    }
    return prepareParsedCircuit({ ...base, elements });
  };
}

/**
 * A stateful sweep solver: `(circuit, paths, points, outputs)` → one row per point. A point the
 * engine refuses is reported in its row (the message as the engine words it); a parameter path
 * that names no element is an InvalidCircuitError thrown for the whole batch.
 */
export function createSweepSolver(): (circuit: CircuitInput, paths: readonly string[], points: readonly (readonly number[])[], outputs: readonly SweepOutputSpec[]) => SweepPointRow[] {
  let network: Network | null = null;
  return (circuit, paths, points, outputs) => {
    const prepare = batchPreparer(circuit, paths);
    const needBuses = outputs.some((o) => o.kind !== 'load');
    const needLoads = outputs.some((o) => o.kind === 'load');
    return points.map((values) => {
      try {
        const prepared = prepare(values);
        const limits = resolveLimits(prepared.circuit.limits);
        if (network) network.update(prepared.primitives);
        else network = createNetwork(prepared.primitives);
        const sol = network.solve();
        const buses = needBuses ? busResults(prepared.context, prepared.expansions, sol, new Set(sol.floating.flatMap((f) => f.nodes))) : [];
        const loads = needLoads ? loadResults(prepared.expansions, sol.nodeVolts, limits) : [];
        return { outputs: outputs.map((o) => sweepOutputValue({ buses, loads }, o)) };
      } catch (e) {
        // a failed update may leave the cached network unusable: start afresh at the next point
        network = null;
        const error = e instanceof EngineError ? e.message : `the solver stopped unexpectedly: ${(e as Error).message}`;
        return { outputs: outputs.map(() => null), error };
      }
    });
  };
}
