/// <reference lib="webworker" />
/** The live-solve Web Worker: the shared engine off the main thread, one request at a time. */
import '../../../lib/zod-csp.ts';
import { createSolveHandler } from './solve-handler.ts';
import type { SolveRequest } from './solve-protocol.ts';

const handle = createSolveHandler();
const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (e: MessageEvent<SolveRequest>) => {
  scope.postMessage(handle(e.data));
};
