/// <reference lib="webworker" />
/** A sweep Web Worker: one of the pool; solves chunks of sweep points (and envelopes) off the page's thread. */
import '../../../lib/zod-csp.ts';
import { createSweepHandler } from './sweep-handler.ts';
import type { SweepRequest } from './sweep-protocol.ts';

const handle = createSweepHandler();
const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (e: MessageEvent<SweepRequest>) => {
  const res = handle(e.data);
  // a chunk's values are moved to the page, not copied
  scope.postMessage(res, res.kind === 'chunk' ? [res.rows.values.buffer] : []);
};
