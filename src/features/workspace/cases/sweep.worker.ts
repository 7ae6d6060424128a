/// <reference lib="webworker" />
/** A sweep Web Worker: one of the pool; solves chunks of sweep points (and envelopes) off the page's thread. */
import '../../../lib/zod-csp.ts';
import { createSweepHandler } from './sweep-handler.ts';
import type { SweepRequest } from './sweep-protocol.ts';

const handle = createSweepHandler();
const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (e: MessageEvent<SweepRequest>) => {
  scope.postMessage(handle(e.data));
};
