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
  // Limits compared by value, so an inline object literal does not re-solve on every render.
  const limitsKey = JSON.stringify(limits ?? null);
  const stableLimits = useMemo(() => limits, [limitsKey]);

  useEffect(() => {
    const onResponse = (res: SolveResponse) => {
      if (res.id !== latestId.current) return; // a newer edit is on its way: drop this answer
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

  useEffect(() => {
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
  }, [circuit, stableLimits, debounceMs]);

  return state;
}
