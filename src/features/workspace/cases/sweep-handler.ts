/**
 * The sweep worker's message handler as a plain function (it runs and is tested outside a Worker
 * too): each point's circuit is the chunk's circuit with the parameters written at their paths,
 * solved keeping the factor's ordering between points of one topology, and reduced to the outputs
 * asked for (only bus and load results are built). A failing point is reported in its row.
 */
import {
  createNetwork,
  elementSchemas,
  EngineError,
  lostNeutralEnvelope,
  parseCircuit,
  prepareCircuit,
  resolveLimits,
  resolveParameter,
  sweepCircuit,
  type Circuit,
  type CircuitInput,
  type ElementType,
  type Network,
  type PreparedCircuit,
} from '../../../../shared/engine/index.ts';
// Not part of the engine's index either: the expansion of a circuit already validated.
import { prepareParsedCircuit } from '../../../../shared/engine/solve-circuit.ts';
// Not part of the engine's index: the parts of the result builder a sweep's outputs need (bus and
// load results), so a point costs no element, power or flag results nobody reads.
import { busResults } from '../../../../shared/engine/results/build-results.ts';
import { loadResults } from '../../../../shared/engine/results/load-results.ts';
import { circuitNames } from '../../../../shared/review/user-names.ts';
import type { PointRow, SweepRequest, SweepResponse } from './sweep-protocol.ts';
import { outputValue, type OutputSpec } from './sweep-outputs.ts';

type Obj = Record<string, unknown>;

/**
 * The prepared circuit of each point of one chunk. The chunk's circuit is validated once; a point
 * re-validates only the elements its parameters change (the format validates element by element,
 * so this is what validating the whole file would find). Where a changed element does not pass,
 * the whole point goes through `prepareCircuit`, whose error then names the element and field.
 */
function chunkPreparer(raw: CircuitInput, paths: readonly string[]): (values: readonly number[]) => PreparedCircuit {
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

/** Solves sweep points, keeping the solver's network (ordering, symbolic factor) while the topology stays. */
function createPointSolver() {
  let network: Network | null = null;
  return (prepare: () => PreparedCircuit, outputs: readonly OutputSpec[]): (number | null)[] => {
    try {
      const prepared = prepare();
      const limits = resolveLimits(prepared.circuit.limits);
      if (network) network.update(prepared.primitives);
      else network = createNetwork(prepared.primitives);
      const sol = network.solve();
      const needBuses = outputs.some((o) => o.kind !== 'load');
      const needLoads = outputs.some((o) => o.kind === 'load');
      const buses = needBuses ? busResults(prepared.context, prepared.expansions, sol, new Set(sol.floating.flatMap((f) => f.nodes))) : [];
      const loads = needLoads ? loadResults(prepared.expansions, sol.nodeVolts, limits) : [];
      return outputs.map((o) => outputValue({ buses, loads }, o));
    } catch (e) {
      // a failed update may leave the cached network unusable: start afresh at the next point
      network = null;
      throw e;
    }
  };
}

export function createSweepHandler(): (req: SweepRequest) => SweepResponse {
  const solvePoint = createPointSolver();
  return (req) => {
    if (req.kind === 'envelope') {
      try {
        return { kind: 'envelope', job: req.job, ok: true, envelope: lostNeutralEnvelope(req.circuit as CircuitInput, req.options) };
      } catch (e) {
        return { kind: 'envelope', job: req.job, ok: false, error: circuitNames(req.circuit).text((e as Error).message) };
      }
    }
    let names: ReturnType<typeof circuitNames> | undefined;
    const words = (m: string) => (names ??= circuitNames(req.circuit)).text(m);
    let prepare: (values: readonly number[]) => PreparedCircuit;
    try {
      prepare = chunkPreparer(req.circuit as CircuitInput, req.paths);
    } catch (e) {
      const error = words((e as Error).message);
      return { kind: 'chunk', job: req.job, start: req.start, rows: req.points.map(() => ({ outputs: req.outputs.map(() => null), error })) };
    }
    const rows: PointRow[] = req.points.map((values) => {
      try {
        return { outputs: solvePoint(() => prepare(values), req.outputs) };
      } catch (e) {
        const message = e instanceof EngineError ? e.message : `the solver stopped unexpectedly: ${(e as Error).message}`;
        return { outputs: req.outputs.map(() => null), error: words(message) };
      }
    });
    return { kind: 'chunk', job: req.job, start: req.start, rows };
  };
}
