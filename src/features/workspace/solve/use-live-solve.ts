/**
 * `useLiveSolve(circuit)`: re-solves in a Web Worker on every change of `circuit`: a change after a
 * quiet spell goes out at once (no delay before the first frame of a single edit), changes that
 * follow one another within the debounce time are coalesced into one request for the last one,
 * drops answers to requests that a newer edit has overtaken, and keeps the last good result on
 * screen while the next one is computed or when the edit failed (`stale` then says so).
 */
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { flushSync } from 'react-dom';
import type { CircuitInput, CircuitResult, LimitsInput } from '../../../../shared/engine/index.ts';
import { json } from '../model/conversion.ts';
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

/**
 * Solves `next` (the circuit an edit is about to make) before the edit is rendered, and calls
 * `commit` (which dispatches the edit) together with the answer, so the edit and its results are
 * rendered and painted once, in the answer's task, instead of the page drawing the edit while the
 * answer waits. `commit` is called without the answer when the answer is not back within the time
 * the last answers took (plus a margin), or when `flushAhead` is called (before any other change, so
 * changes stay in order), and at once when the worker's recent solves took longer than 30 ms (the
 * page then draws the edit while the worker solves). A render whose circuit equals `next` posts
 * nothing: it takes this request.
 */
export type SolveAhead = (next: CircuitInput, commit: () => void) => void;

export interface LiveSolveControls {
  solveAhead: SolveAhead;
  /** Commits an edit held by `solveAhead` now (call before dispatching any other change); true when there was one. */
  flushAhead: () => boolean;
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

/** The latest answer, with the request it answers ('failed': the port itself failed, nothing is pending; `key`: the JSON of a circuit solved ahead of its render). */
interface AnsweredState extends LiveSolveState {
  answers?: SolvedRequest | { key: string; limits: LimitsInput | undefined } | 'failed';
}

/** A request posted by `solveAhead`, its edit held (`commit`) until the answer or the deadline. */
interface AheadRequest {
  id: number;
  key: string;
  limitsKey: string;
  limits: LimitsInput | undefined;
  commit: (() => void) | null;
  timer: ReturnType<typeof setTimeout> | undefined;
}

/** How long an edit is held for its answer: the recent round trips with a margin, within bounds (ms). */
const AHEAD_MIN_MS = 25;
const AHEAD_MAX_MS = 250;
/**
 * An edit is held only while the worker's own time for recent answers is at most this (ms): a longer
 * solve leaves the page time to draw the edit meanwhile, so the edit is drawn at once (its request
 * still goes out first) and the answer follows, as holding it would only add the edit's render after the wait.
 */
const AHEAD_HOLD_MAX_WORKER_MS = 30;

/** Live solve of a circuit in the engine's format; `null` means nothing to solve yet. */
export function useLiveSolve(circuit: CircuitInput | null, options: LiveSolveOptions = {}): LiveSolveState & LiveSolveControls {
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
  // eslint-disable-next-line react-hooks/exhaustive-deps -- limitsKey is the limits' value: a new object with the same value keeps the memo
  const stableLimits = useMemo(() => limits, [limitsKey]);
  const current = useRef({ limitsKey, limits: stableLimits });
  current.current = { limitsKey, limits: stableLimits };
  const ahead = useRef<AheadRequest | null>(null);
  /** When the latest request was posted, and the worker round trip of recent answers (ms, smoothed). */
  const postedAt = useRef(new Map<number, number>());
  const roundTrip = useRef<number | null>(null);
  /** The worker's own time of recent answers (ms, smoothed). */
  const workerMs = useRef<number | null>(null);
  const post = (port: SolvePort, req: { id: number; circuit: CircuitInput; limits: LimitsInput | undefined }) => {
    postedAt.current.clear();
    postedAt.current.set(req.id, performance.now());
    port.post(req);
  };

  const flushAhead = useCallback(() => {
    const a = ahead.current;
    if (!a?.commit) return false;
    const commit = a.commit;
    a.commit = null;
    clearTimeout(a.timer);
    commit();
    return true;
  }, []);

  const solveAhead = useCallback<SolveAhead>(
    (next, commit) => {
      flushAhead();
      const port = portRef.current;
      if (!port) return commit();
      const id = ++latestId.current;
      lastChange.current = performance.now();
      const { limitsKey: lk, limits: lim } = current.current;
      const wait = Math.min(AHEAD_MAX_MS, Math.max(AHEAD_MIN_MS, roundTrip.current === null ? AHEAD_MIN_MS : 1.5 * roundTrip.current + 10));
      const a: AheadRequest = { id, key: json(next), limitsKey: lk, limits: lim, commit, timer: undefined };
      // Past the deadline the edit is drawn without its answer (rendered at once, as an answer would be).
      a.timer = setTimeout(() => {
        if (a.commit && ahead.current === a) flushSync(flushAhead);
      }, wait);
      ahead.current = a;
      post(port, { id, circuit: next, limits: lim });
      // A slow solve: the edit is drawn while the worker solves (the render takes the request posted above).
      if (workerMs.current !== null && workerMs.current > AHEAD_HOLD_MAX_WORKER_MS) flushAhead();
    },
    [flushAhead],
  );

  useEffect(() => {
    const onResponse = (res: SolveResponse) => {
      if (res.id !== latestId.current) return; // a newer edit is on its way: drop this answer
      const sent = postedAt.current.get(res.id);
      if (sent !== undefined) {
        const rt = performance.now() - sent;
        roundTrip.current = roundTrip.current === null ? rt : 0.5 * roundTrip.current + 0.5 * rt;
      }
      workerMs.current = workerMs.current === null ? res.ms : 0.5 * workerMs.current + 0.5 * res.ms;
      const a = ahead.current;
      // An edit held for this answer: the edit and its answer are rendered together.
      const held = a && a.id === res.id && a.commit ? a : null;
      const answers = held ? { key: held.key, limits: held.limits } : (latestRequest.current ?? undefined);
      // Rendered at once, in the message's own task, rather than in one the scheduler queues behind it.
      flushSync(() => {
        if (held) flushAhead();
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
      clearTimeout(ahead.current?.timer);
      ahead.current = null;
    };
    // eslint-disable-next-line react-hooks/exhaustive-deps -- flushAhead is stable
  }, []);

  // A change after a quiet spell goes to the worker from this render, before the components below
  // render and the browser paints the edit: the worker solves while the page draws. (Guarded by the
  // circuit's identity, so a render repeated for the same circuit posts nothing; the port does not
  // exist yet on the very first render, and the effect below posts then.)
  const preposted = useRef<{ circuit: CircuitInput; id: number } | null>(null);
  if (circuit !== null && portRef.current && preposted.current?.circuit !== circuit && lastCircuit.current !== circuit) {
    const t = performance.now();
    const a = ahead.current;
    if (a && a.id === latestId.current && a.limitsKey === limitsKey && a.key === json(circuit)) {
      // Solved ahead (see solveAhead): this render takes that request, answered or still on its way.
      ahead.current = null;
      preposted.current = { circuit, id: a.id };
      latestRequest.current = { circuit, limits: stableLimits };
    } else if (a?.commit) {
      // An earlier edit committed by a newer one held for its answer: the newer one follows at once, nothing to post.
    } else if (t - lastChange.current >= debounceMs && limitsKey === postedLimitsKey.current) {
      const id = ++latestId.current;
      lastChange.current = t;
      preposted.current = { circuit, id };
      latestRequest.current = { circuit, limits: stableLimits };
      post(portRef.current, { id, circuit, limits: stableLimits });
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
    if (ahead.current?.commit) return; // a newer edit is held for its answer (solveAhead): this one is overtaken
    // The id is taken at edit time, so an answer to an older edit that lands during the debounce is dropped too.
    const id = ++latestId.current;
    latestRequest.current = { circuit, limits: stableLimits };
    const send = () => portRef.current && post(portRef.current, { id, circuit, limits: stableLimits });
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
  return useMemo<LiveSolveState & LiveSolveControls>(() => {
    const { answers, ...shown } = state;
    const controls = { solveAhead, flushAhead };
    if (circuit === null || answers === 'failed' || (answers && answers.limits === stableLimits && ('circuit' in answers ? answers.circuit === circuit : answers.key === json(circuit)))) return { ...shown, ...controls };
    if (state.status === 'idle' && answers === undefined && state.result === undefined) return { status: 'solving', ...controls };
    return { ...shown, status: 'solving', stale: state.result !== undefined, ...controls };
  }, [state, circuit, stableLimits, solveAhead, flushAhead]);
}

