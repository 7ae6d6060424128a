/**
 * The solve worker's message handler, as a plain function so it runs (and is tested) outside a
 * Worker too. It keeps the prepared circuit and the solver's network between calls: an edit
 * re-validates and re-expands only the elements it changed, and when only values change (a load's
 * kW, a line length), the ordering and symbolic factorisation are reused (`Network.update`).
 */
import { EngineError, InvalidCircuitError, createNetwork, prepareChanged, prepareCircuit, resolveLimits, type CircuitInput, type Network, type PreparedChange, type PreparedCircuit, type Primitive } from '../../../../shared/engine/index.ts';
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

/**
 * A stateful handler: request in, response out (never throws). It keeps the circuit it was sent
 * (a request may carry only the elements that changed: solve-request.ts), the circuit as last
 * prepared (validated and expanded) and the elements changed since, so an edit re-validates and
 * re-expands only those (`prepareChanged`), and the solver's network, told which primitives changed.
 */
export function createSolveHandler(): (req: SolveRequest) => SolveResponse {
  let network: Network | null = null;
  /** The primitive list the network was last updated with. */
  let networkHolds: readonly Primitive[] | null = null;
  /** The circuit as sent (whole, then with each request's changes applied). */
  let raw: CircuitInput | null = null;
  /** The last circuit prepared, and the positions of the elements changed in `raw` since (null: prepare whole). */
  let prepared: PreparedCircuit | null = null;
  const dirty = new Set<number>();
  return (req) => {
    const t0 = now();
    try {
      if (req.changes) {
        if (!raw) throw new Error('a change arrived before any circuit');
        const elements = (raw.elements as unknown[]).slice();
        req.changes.at.forEach((i, k) => {
          elements[i] = req.changes!.elements[k];
          dirty.add(i);
        });
        raw = { ...raw, elements } as CircuitInput;
      } else {
        raw = req.circuit as CircuitInput;
        prepared = null;
        dirty.clear();
      }
    } catch (e) {
      return { id: req.id, ok: false, error: toLiveSolveError(e), ms: now() - t0 };
    }
    const circuit = raw;
    try {
      const base = prepared;
      const next: PreparedChange = base ? prepareChanged(base, circuit, [...dirty]) : prepareCircuit(circuit);
      prepared = next;
      dirty.clear();
      const limits = resolveLimits(next.circuit.limits, req.limits);
      if (network && next.changed && base && networkHolds === base.primitives) network.update(next.primitives, next.changed);
      else if (network) network.update(next.primitives);
      else network = createNetwork(next.primitives);
      networkHolds = next.primitives;
      const solution = network.solve();
      const result = buildResults(next.circuit, next.context, next.expansions, solution, limits);
      return { id: req.id, ok: true, result, ms: now() - t0, timings: network.lastTimings() };
    } catch (e) {
      // A failed update may leave the cached network unusable: start afresh next time.
      network = null;
      networkHolds = null;
      const error = toLiveSolveError(e);
      if (error.issues) {
        if (error.elementIds.length === 0) error.elementIds = elementIdsFromIssues(circuit, error.issues);
        // Worded here, where the circuit is at hand: the element a path points into is named as drawn,
        // and a number typed as text is reported as such (not as the union the validator tried).
        const byPath = new Map(error.issues.map((i) => [i.path, i.message]));
        error.issues = Object.entries(circuitIssueFields(circuit, error.issues)).map(([path, text]) => ({ path, message: byPath.get(path) ?? text, text }));
      }
      return { id: req.id, ok: false, error, ms: now() - t0 };
    }
  };
}
