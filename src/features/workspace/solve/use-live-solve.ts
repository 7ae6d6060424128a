/**
 * `useLiveSolve(circuit)`: re-solves in a Web Worker on every change of `circuit`: a change after a
 * quiet spell goes out at once (no delay before the first frame of a single edit), changes that
 * follow one another within the debounce time are coalesced into one request for the last one,
 * drops answers to requests that a newer edit has overtaken, and keeps the last good result on
 * screen while the next one is computed or when the edit failed (`stale` then says so).
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import { flushSync } from 'react-dom';
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

interface SolvedRequest {
  circuit: CircuitInput;
  limits: LimitsInput | undefined;
}

/** The latest answer, with the request it answers ('failed': the port itself failed, nothing is pending). */
interface AnsweredState extends LiveSolveState {
  answers?: SolvedRequest | 'failed';
}

/** Live solve of a circuit in the engine's format; `null` means nothing to solve yet. */
export function useLiveSolve(circuit: CircuitInput | null, options: LiveSolveOptions = {}): LiveSolveState {
  const { debounceMs = 50, limits, createPort = createDefaultPort } = options;
  const [state, setState] = useState<AnsweredState>({ status: 'idle' });
  /** The circuit and limits of the latest request (what an answer to `latestId` belongs to). */
  const latestRequest = useRef<SolvedRequest | null>(null);
  const portRef = useRef<SolvePort | null>(null);
  const latestId = useRef(0);
  /** When the circuit last changed (performance.now()), to tell a single edit from a burst. */
  const lastChange = useRef(-Infinity);
  const createPortRef = useRef(createPort);
  /** The circuit (and limits) the effect last handled: a render with another one is a new edit. */
  const lastCircuit = useRef<CircuitInput | null>(null);
  const postedLimitsKey = useRef<string | null>(null);
  // Limits compared by value, so an inline object literal does not re-solve on every render.
  const limitsKey = JSON.stringify(limits ?? null);
  const stableLimits = useMemo(() => limits, [limitsKey]);

  useEffect(() => {
    const onResponse = (res: SolveResponse) => {
      if (res.id !== latestId.current) return; // a newer edit is on its way: drop this answer
      const answers = latestRequest.current ?? undefined;
      // Rendered at once, in the message's own task, rather than in one the scheduler queues behind it.
      flushSync(() => {
        if (res.ok) setState({ status: 'ok', result: res.result, ms: res.ms, answers });
        else setState((s) => ({ status: 'error', result: s.result, error: res.error, ms: res.ms, stale: s.result !== undefined, answers }));
      });
    };
    const onFailure = (message: string) =>
      setState((s) => ({ status: 'error', result: s.result, stale: s.result !== undefined, error: { code: 'internal', message: `Live solve is unavailable: ${message}`, elementIds: [], nodes: [] }, answers: 'failed' }));
    const port = createPortRef.current(onResponse, onFailure);
    portRef.current = port;
    return () => {
      port.terminate();
      portRef.current = null;
    };
  }, []);

  // A change after a quiet spell goes to the worker from this render, before the components below
  // render and the browser paints the edit: the worker solves while the page draws. (Guarded by the
  // circuit's identity, so a render repeated for the same circuit posts nothing; the port does not
  // exist yet on the very first render, and the effect below posts then.)
  const preposted = useRef<{ circuit: CircuitInput; id: number } | null>(null);
  if (circuit !== null && portRef.current && preposted.current?.circuit !== circuit && lastCircuit.current !== circuit) {
    const t = performance.now();
    if (t - lastChange.current >= debounceMs && limitsKey === postedLimitsKey.current) {
      const id = ++latestId.current;
      lastChange.current = t;
      preposted.current = { circuit, id };
      latestRequest.current = { circuit, limits: stableLimits };
      portRef.current.post({ id, circuit, limits: stableLimits });
    }
  }

  useEffect(() => {
    lastCircuit.current = circuit;
    postedLimitsKey.current = limitsKey;
    if (circuit === null) {
      latestId.current += 1; // anything in flight is now stale
      latestRequest.current = null;
      setState({ status: 'idle' });
      return;
    }
    if (preposted.current?.circuit === circuit && preposted.current.id === latestId.current) return; // posted by the render above
    // The id is taken at edit time, so an answer to an older edit that lands during the debounce is dropped too.
    const id = ++latestId.current;
    latestRequest.current = { circuit, limits: stableLimits };
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

  // "Solving" is read off the state rather than set: the state answers another circuit (or other
  // limits) than the one given. So an edit costs no render of its own to say so.
  return useMemo<LiveSolveState>(() => {
    const { answers, ...shown } = state;
    if (circuit === null || answers === 'failed' || (answers && answers.circuit === circuit && answers.limits === stableLimits)) return shown;
    if (state.status === 'idle' && answers === undefined && state.result === undefined) return { status: 'solving' };
    return { ...shown, status: 'solving', stale: state.result !== undefined };
  }, [state, circuit, stableLimits]);
}

