/**
 * `useLiveSolve(circuit)`: re-solves in a Web Worker on every change of `circuit`: a change after a
 * quiet spell goes out at once (no delay before the first frame of a single edit), changes that
 * follow one another within the debounce time are coalesced into one request for the last one,
 * drops answers to requests that a newer edit has overtaken, and keeps the last good result on
 * screen while the next one is computed or when the edit failed (`stale` then says so).
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import type { CircuitInput, CircuitResult, LimitsInput } from '../../../../shared/engine/index.ts';
import { createDefaultPort, type PortFailure, type PortListener, type SolvePort } from './solve-port.ts';
import type { LiveSolveError, SolveResponse } from './solve-protocol.ts';

export type LiveSolveStatus = 'idle' | 'solving' | 'ok' | 'error';

export interface LiveSolveState {
  status: LiveSolveStatus;
  /** The latest good result (kept while solving and after an error; see `stale`). */
  result?: CircuitResult;
  /** The error of the latest edit, when it failed. */
  error?: LiveSolveError;
  /** Time of the latest answered request in the worker, ms. */
  ms?: number;
  /** True when `result` belongs to an earlier edit than the one shown as failing or solving. */
  stale?: boolean;
}

export interface LiveSolveOptions {
  /**
   * Debounce, ms (default 50): a change less than this after the previous one waits until the
   * changes stop for this long; a change after a longer quiet spell is sent at once.
   */
  debounceMs?: number;
  /** Limit-set overrides applied over the circuit's own. */
  limits?: LimitsInput;
  /** Port factory (default: a Web Worker, or the in-thread handler where Workers do not exist). */
  createPort?: (onResponse: PortListener, onFailure: PortFailure) => SolvePort;
}

/** Live solve of a circuit in the engine's format; `null` means nothing to solve yet. */
export function useLiveSolve(circuit: CircuitInput | null, options: LiveSolveOptions = {}): LiveSolveState {
  const { debounceMs = 50, limits, createPort = createDefaultPort } = options;
  const [state, setState] = useState<LiveSolveState>({ status: 'idle' });
  const portRef = useRef<SolvePort | null>(null);
  const latestId = useRef(0);
  /** When the circuit last changed (performance.now()), to tell a single edit from a burst. */
  const lastChange = useRef(-Infinity);
  const createPortRef = useRef(createPort);
  /** The circuit (and limits) the effect last handled: a render with another one is a new edit. */
  const lastCircuit = useRef<CircuitInput | null>(null);
  const postedLimitsKey = useRef<string | null>(null);
  /** Id of the latest request answered (a request posted from render can be answered before the effect runs). */
  const answeredId = useRef(0);
  // Limits compared by value, so an inline object literal does not re-solve on every render.
  const limitsKey = JSON.stringify(limits ?? null);
  const stableLimits = useMemo(() => limits, [limitsKey]);

  useEffect(() => {
    const onResponse = (res: SolveResponse) => {
      if (res.id !== latestId.current) return; // a newer edit is on its way: drop this answer
      answeredId.current = res.id;
      if (res.ok) setState({ status: 'ok', result: res.result, ms: res.ms });
      else setState((s) => ({ status: 'error', result: s.result, error: res.error, ms: res.ms, stale: s.result !== undefined }));
    };
    const onFailure = (message: string) =>
      setState((s) => ({ status: 'error', result: s.result, stale: s.result !== undefined, error: { code: 'internal', message: `Live solve is unavailable: ${message}`, elementIds: [], nodes: [] } }));
    const port = createPortRef.current(onResponse, onFailure);
    portRef.current = port;
    return () => {
      port.terminate();
      portRef.current = null;
    };
  }, []);

  // A change after a quiet spell goes to the worker from this render, before the components below
  // render and the browser paints the edit: the worker solves while the page draws. The effect below
  // then only marks the state as solving. (Guarded by the circuit's identity, so a render repeated
  // for the same circuit posts nothing; the port may not exist yet on the very first render, and
  // the effect posts then.)
  const preposted = useRef<{ circuit: CircuitInput; id: number } | null>(null);
  if (circuit !== null && portRef.current && preposted.current?.circuit !== circuit && lastCircuit.current !== circuit) {
    const t = performance.now();
    if (t - lastChange.current >= debounceMs && limitsKey === postedLimitsKey.current) {
      const id = ++latestId.current;
      lastChange.current = t;
      preposted.current = { circuit, id };
      portRef.current.post({ id, circuit, limits: stableLimits });
    }
  }

  useEffect(() => {
    lastCircuit.current = circuit;
    postedLimitsKey.current = limitsKey;
    if (circuit !== null && preposted.current?.circuit === circuit && preposted.current.id === latestId.current) {
      // already posted by the render above (and perhaps answered already)
      if (answeredId.current !== preposted.current.id) setState((s) => ({ ...s, status: 'solving', stale: s.result !== undefined }));
      return;
    }
    if (circuit === null) {
      latestId.current += 1; // anything in flight is now stale
      setState({ status: 'idle' });
      return;
    }
    // The id is taken at edit time, so an answer to an older edit that lands during the debounce is dropped too.
    const id = ++latestId.current;
    setState((s) => ({ ...s, status: 'solving', stale: s.result !== undefined }));
    const send = () => portRef.current?.post({ id, circuit, limits: stableLimits });
    const t = performance.now();
    const quiet = t - lastChange.current;
    lastChange.current = t;
    if (quiet >= debounceMs) {
      send();
      return;
    }
    const timer = setTimeout(send, debounceMs);
    return () => clearTimeout(timer);
    // eslint-disable-next-line react-hooks/exhaustive-deps -- limitsKey stands for stableLimits
  }, [circuit, stableLimits, debounceMs]);

  return state;
}
