/** Messages between the page and the solve worker (structured-clone safe: plain data only). */
import type { CircuitResult, LimitsInput, SolveTimings } from '../../../../shared/engine/index.ts';

/**
 * A solve request; `id` increases with every edit so stale answers can be dropped. It carries
 * either the whole circuit, or only the elements that differ from the previous request's circuit
 * (`changes`: their positions and new values; same number of elements, every other field the
 * same), which the worker applies to the circuit it holds (see solve-request.ts).
 */
export interface SolveRequest {
  id: number;
  circuit?: unknown;
  changes?: { at: number[]; elements: unknown[] };
  limits?: LimitsInput;
}

/**
 * An engine error as plain fields (an Error's own properties do not survive postMessage).
 * `code` is the engine's EngineErrorCode, or 'internal' for anything unexpected.
 */
export interface LiveSolveError {
  code: string;
  message: string;
  elementIds: string[];
  nodes: string[];
  /** Schema problems: `path` in the circuit file, the validator's `message`, and `text`, the problem as a form error naming the element as drawn. */
  issues?: { path: string; message: string; text?: string }[];
}

/** `ms`: the whole request in the worker (validate, expand, solve, build results); `timings`: the solver's part (analysis is 0 ms when the topology was reused). */
export type SolveResponse =
  | { id: number; ok: true; result: CircuitResult; ms: number; timings: SolveTimings }
  | { id: number; ok: false; error: LiveSolveError; ms: number };
