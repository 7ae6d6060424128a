/**
 * The solve worker's message handler, as a plain function so it runs (and is tested) outside a
 * Worker too. It keeps the solver's network between calls: when only values change (a load's kW,
 * a line length), the ordering and symbolic factorisation are reused (`Network.update`).
 */
import { EngineError, InvalidCircuitError, createNetwork, prepareCircuit, resolveLimits, type Network } from '../../../../shared/engine/index.ts';
// Not part of the engine's index: the result builder is what `solveCircuit` runs after the solver.
import { buildResults } from '../../../../shared/engine/results/build-results.ts';
import { circuitIssueFields } from '../../../../shared/review/circuit-issues.ts';
import type { LiveSolveError, SolveRequest, SolveResponse } from './solve-protocol.ts';

const now = (): number => (typeof performance !== 'undefined' ? performance.now() : Date.now());

/** Plain fields of any thrown value (typed engine errors keep code, element ids, nodes, issues). */
export function toLiveSolveError(e: unknown): LiveSolveError {
  if (e instanceof EngineError) {
    const out: LiveSolveError = { code: e.code, message: e.message, elementIds: [...e.elementIds], nodes: [...e.nodes] };
    if (e instanceof InvalidCircuitError) out.issues = e.issues.map((i) => ({ path: i.path, message: i.message }));
    return out;
  }
  const message = e instanceof Error ? e.message : String(e);
  return { code: 'internal', message: `The solver stopped unexpectedly: ${message}`, elementIds: [], nodes: [] };
}

/**
 * Schema problems come with JSON paths (`elements[3].each.kw`) but no element ids: take the id of
 * each element a path points into, so the canvas can show the error beside it.
 */
export function elementIdsFromIssues(circuit: unknown, issues: readonly { path: string }[]): string[] {
  const elements = (circuit as { elements?: unknown } | null)?.elements;
  if (!Array.isArray(elements)) return [];
  const ids = new Set<string>();
  for (const { path } of issues) {
    const m = /^elements\[(\d+)\]/.exec(path);
    const el = m ? (elements[Number(m[1])] as { id?: unknown } | undefined) : undefined;
    if (el && typeof el.id === 'string') ids.add(el.id);
  }
  return [...ids];
}

/** A stateful handler: request in, response out (never throws). */
export function createSolveHandler(): (req: SolveRequest) => SolveResponse {
  let network: Network | null = null;
  return (req) => {
    const t0 = now();
    try {
      const prepared = prepareCircuit(req.circuit);
      const limits = resolveLimits(prepared.circuit.limits, req.limits);
      if (network) network.update(prepared.primitives);
      else network = createNetwork(prepared.primitives);
      const solution = network.solve();
      const result = buildResults(prepared.circuit, prepared.context, prepared.expansions, solution, limits);
      return { id: req.id, ok: true, result, ms: now() - t0, timings: network.lastTimings() };
    } catch (e) {
      // A failed update may leave the cached network unusable: start afresh next time.
      network = null;
      const error = toLiveSolveError(e);
      if (error.issues) {
        if (error.elementIds.length === 0) error.elementIds = elementIdsFromIssues(req.circuit, error.issues);
        // Worded here, where the circuit is at hand: the element a path points into is named as drawn,
        // and a number typed as text is reported as such (not as the union the validator tried).
        const byPath = new Map(error.issues.map((i) => [i.path, i.message]));
        error.issues = Object.entries(circuitIssueFields(req.circuit, error.issues)).map(([path, text]) => ({ path, message: byPath.get(path) ?? text, text }));
      }
      return { id: req.id, ok: false, error, ms: now() - t0 };
    }
  };
}
