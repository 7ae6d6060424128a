/** What the request thread and the embedded database's thread (pglite-client.ts, pglite-thread.mjs) say to each other, besides the wire protocol. */
import type { MessagePort } from 'node:worker_threads';

export interface ThreadData {
  dataDir?: string;
  /** A dumped data directory (tar, optionally gzipped) to start from. */
  loadDataDir?: ArrayBuffer;
  /** postgresql.conf lines (POSTGRES_SETTINGS). */
  settings: string[];
  /** Int32Array over it: [BUSY] 1 while a statement runs, [SINCE] when it started (ms after `epoch`). */
  state: SharedArrayBuffer;
  /** Which slots of `state` hold what (BUSY, SINCE below: the thread is plain JavaScript and takes them from here). */
  slots: { busy: number; since: number };
  epoch: number;
}

/** Slots of the shared state. */
export const BUSY = 0;
export const SINCE = 1;

/** Messages from the request thread on the worker's own port. */
export type ControlMessage =
  | { type: 'connect'; port: MessagePort }
  | { type: 'ping'; id: number }
  | { type: 'dump'; id: number }
  | { type: 'close'; id: number };

/** Answers on the worker's own port. */
export type ControlAnswer =
  | { type: 'ready' }
  | { type: 'failed'; message: string }
  | { type: 'done'; id: number; ok: boolean; message?: string; dump?: ArrayBuffer };
