/**
 * Where solve requests go: the Web Worker in a browser, or the same handler on the main thread
 * (after a macrotask, so the page still paints) where Workers do not exist (tests, old runtimes).
 */
import { createSolveHandler } from './solve-handler.ts';
import type { CircuitInput, LimitsInput } from '../../../../shared/engine/index.ts';
import type { SolveResponse } from './solve-protocol.ts';
import { createRequestEncoder } from './solve-request.ts';

/** What the page asks: the circuit to solve (the port sends the worker only what changed since its last request). */
export interface PortRequest {
  id: number;
  circuit: CircuitInput;
  limits?: LimitsInput;
}

export interface SolvePort {
  post(req: PortRequest): void;
  /** Stop the worker; later responses are never delivered. */
  terminate(): void;
}

export type PortListener = (res: SolveResponse) => void;
/** Called when the port itself fails (the worker script did not load or crashed). */
export type PortFailure = (message: string) => void;

/** The live-solve Web Worker (module worker, bundled by vite). */
export function createWorkerPort(onResponse: PortListener, onFailure: PortFailure): SolvePort {
  const worker = new Worker(new URL('./solve.worker.ts', import.meta.url), { type: 'module', name: 'wyeward-solve' });
  worker.onmessage = (e: MessageEvent<SolveResponse>) => onResponse(e.data);
  worker.onerror = (e: ErrorEvent) => {
    e.preventDefault();
    onFailure(e.message || 'the solve worker could not start');
  };
  const encode = createRequestEncoder();
  return { post: (req) => worker.postMessage(encode(req)), terminate: () => worker.terminate() };
}

/** The same handler on the main thread, one macrotask later (requests stay in order). */
export function createInThreadPort(onResponse: PortListener): SolvePort {
  const handle = createSolveHandler();
  const encode = createRequestEncoder();
  let alive = true;
  return {
    post(req) {
      const message = encode(req);
      setTimeout(() => {
        if (!alive) return;
        const res = handle(message);
        if (alive) onResponse(res);
      }, 0);
    },
    terminate() {
      alive = false;
    },
  };
}

/** A Worker port when the runtime has Workers, otherwise the in-thread port. */
export function createDefaultPort(onResponse: PortListener, onFailure: PortFailure): SolvePort {
  return typeof Worker !== 'undefined' ? createWorkerPort(onResponse, onFailure) : createInThreadPort(onResponse);
}
