/**
 * The request thread's side of the embedded database: starts PGlite in its own worker thread
 * (pglite-thread.mjs) and connects node-postgres to it, so the app reaches PGlite through the same
 * driver, pool and Drizzle client as a PostgreSQL server. A connection is a `Duplex` over a
 * MessagePort (node-postgres accepts any stream in place of its socket); the pool holds one, since
 * PGlite has one session (transactions take turns, as before).
 *
 * Why: PGlite runs each statement synchronously; in the request thread a 2 MB insert stalled every
 * other request for its whole length.
 */
import { Duplex } from 'node:stream';
import v8 from 'node:v8';
import { fileURLToPath } from 'node:url';
import { MessageChannel, Worker, type MessagePort } from 'node:worker_threads';
import pg from 'pg';
import { BUSY, SINCE, type ControlAnswer, type ControlMessage, type ThreadData } from './pglite-messages.ts';

export interface PgliteThreadOptions {
  dataDir?: string;
  loadDataDir?: Blob;
  settings: string[];
}

/** Young generation of the database thread's JavaScript heap (V8's default grows it to 16–48 MB). */
const YOUNG_GENERATION_MB = 4;

/** Answers, and batches of messages, of at least this many bytes are moved to the other thread (transferred); smaller ones are copied, which costs less. */
const MOVE_BYTES = 16 * 1024;

/** Atomics.waitAsync (in Node since 16; ES2024, newer than the project's `lib`). */
const waitAsync = (
  Atomics as unknown as {
    waitAsync(a: Int32Array, index: number, value: number, timeoutMs?: number): { async: false; value: 'not-equal' | 'timed-out' } | { async: true; value: Promise<'ok' | 'timed-out'> };
  }
).waitAsync;

/** A statement running for longer than this makes the health probe wait for the thread (and so time out when stuck). */
export const BUSY_HEALTHY_MS = 1000;

export interface PgliteThread {
  /** A pool of one connection to the thread's PGlite. */
  pool: pg.Pool;
  /**
   * The health probe: resolves when the thread answers a round trip (running `select 1` between
   * statements), or at once while it is inside a statement begun less than BUSY_HEALTHY_MS ago: a
   * single-session database cannot answer a second query during one, and a statement that has just
   * begun is the database working, not failing. Past that it waits for the round trip.
   */
  ping(): Promise<void>;
  /** The data directory as a gzipped tarball (tests keep a migrated one as a template). */
  dump(): Promise<Blob>;
  /** Ends the pool's connection, closes PGlite (its files consistent) and stops the thread. */
  close(): Promise<void>;
}

/** A node-postgres socket that is a MessagePort to the database thread. */
class ThreadSocket extends Duplex {
  private port: MessagePort | null = null;
  private queued: Uint8Array[] = [];

  constructor(private readonly open: () => MessagePort) {
    super();
  }

  // What node-postgres calls on a net.Socket.
  setNoDelay() {
    return this;
  }
  setKeepAlive() {
    return this;
  }
  ref() {
    return this;
  }
  unref() {
    return this;
  }

  connect() {
    try {
      this.port = this.open();
    } catch (err) {
      process.nextTick(() => this.destroy(err as Error));
      return this;
    }
    this.port.on('message', (m: Uint8Array | { error: string }) => {
      if (m instanceof Uint8Array) this.push(Buffer.from(m.buffer, m.byteOffset, m.byteLength));
      else this.destroy(new Error(`embedded database: ${m.error}`));
    });
    this.port.on('close', () => {
      this.push(null);
    });
    process.nextTick(() => this.emit('connect'));
    return this;
  }

  _read() {}

  /** The messages of one query are written one by one in the same tick: send them as one batch. */
  _write(chunk: Buffer, _enc: BufferEncoding, done: (err?: Error | null) => void) {
    if (this.queued.length === 0) queueMicrotask(() => this.flushQueued());
    this.queued.push(chunk);
    done();
  }

  /**
   * Sends the queued messages as one batch. Small ones are copied together into one array; a large
   * one (a Bind carrying a big parameter) is moved as node-postgres wrote it, not copied: it owns
   * its ArrayBuffer (node-postgres's writer starts a new one after each message), and copying
   * megabytes into fresh memory costs the request thread milliseconds per megabyte on this kind of
   * machine (page faults), in the same task as the query's serialisation.
   */
  private flushQueued() {
    if (!this.port || this.queued.length === 0) return;
    const parts: Uint8Array[] = [];
    const moved: ArrayBuffer[] = [];
    let small: Uint8Array[] = [];
    const gather = () => {
      if (small.length === 0) return;
      const total = small.reduce((n, c) => n + c.byteLength, 0);
      const bytes = new Uint8Array(total); // its own ArrayBuffer (a Buffer may be a slice of a shared pool), so it can be moved
      let at = 0;
      for (const c of small) {
        bytes.set(c, at);
        at += c.byteLength;
      }
      parts.push(bytes);
      if (total >= MOVE_BYTES) moved.push(bytes.buffer);
      small = [];
    };
    for (const c of this.queued) {
      if (c.byteLength >= MOVE_BYTES && c.buffer instanceof ArrayBuffer && c.buffer.byteLength < 2 * c.byteLength + 64 * 1024 && !moved.includes(c.buffer)) {
        gather();
        parts.push(c);
        moved.push(c.buffer);
      } else small.push(c);
    }
    gather();
    this.queued = [];
    const message = parts.length === 1 ? parts[0] : parts;
    try {
      this.port.postMessage(message, moved);
    } catch {
      // A buffer that may not be moved (one of Node's shared pools): copied instead.
      this.port.postMessage(message);
    }
  }

  _final(done: (err?: Error | null) => void) {
    this.flushQueued();
    this.port?.close();
    done();
  }

  _destroy(err: Error | null, done: (err?: Error | null) => void) {
    this.port?.close();
    this.port = null;
    done(err);
  }
}

/** Most distinct statement texts given a name (and so kept parsed in the database session); later ones run unnamed. */
export const MAX_NAMED_STATEMENTS = 400;

const statementNames = new Map<string, string>();

/** The name under which `text` is kept prepared (the same text always gets the same name), or undefined past the cap. */
function statementName(text: string): string | undefined {
  let name = statementNames.get(text);
  if (name === undefined && statementNames.size < MAX_NAMED_STATEMENTS) {
    name = `w${statementNames.size + 1}`;
    statementNames.set(text, name);
  }
  return name;
}

/**
 * A node-postgres client that gives every parameterised query (the ones it already sends with the
 * extended protocol: Parse, Bind, Execute) a statement name from its text. node-postgres then sends
 * Parse only the first time a connection runs that text, and PGlite keeps the parsed statement and
 * its plan instead of parsing, analysing and planning it again on every request: the embedded
 * database's thread is what limits the request rate. Queries without parameters (migrations, which
 * may hold several statements) stay on the simple protocol, unnamed. A new connection starts with
 * no statements (pglite-thread.mjs deallocates the previous connection's).
 */
class NamingClient extends pg.Client {
  // @ts-expect-error one implementation for node-postgres's overloads
  override query(config: unknown, values?: unknown, callback?: unknown) {
    if (typeof config === 'string' || (config !== null && typeof config === 'object' && !('submit' in config))) {
      const c = (typeof config === 'string' ? { text: config } : config) as pg.QueryConfig;
      const params = Array.isArray(values) ? values : c.values;
      if (!c.name && typeof c.text === 'string' && Array.isArray(params) && params.length > 0) {
        const name = statementName(c.text);
        if (name) config = { ...c, name };
      }
    }
    return (super.query as (...args: unknown[]) => unknown)(config, values, callback);
  }
}

/** Starts the thread, waits until PGlite is open, and returns its pool and controls. */
export async function startPgliteThread(options: PgliteThreadOptions): Promise<PgliteThread> {
  const state = new SharedArrayBuffer(8);
  const flags = new Int32Array(state);
  const epoch = Date.now();
  const loadDataDir = options.loadDataDir ? await options.loadDataDir.arrayBuffer() : undefined;
  const data: ThreadData = { dataDir: options.dataDir, loadDataDir, settings: options.settings, state, slots: { busy: BUSY, since: SINCE }, epoch };
  // PGlite's WebAssembly module is 9 MB, most of which a running app never calls: compiled lazily
  // (each function when first called, as newer V8 versions do by default) its machine code takes tens
  // of MB less than compiling all of it at start. A V8 flag of the whole process, read when a module is compiled.
  v8.setFlagsFromString('--wasm-lazy-compilation');
  const worker = new Worker(fileURLToPath(new URL('./pglite-thread.mjs', import.meta.url)), {
    workerData: data,
    transferList: loadDataDir ? [loadDataDir] : [],
    // Plain JavaScript: no TypeScript loader in this thread (the process's `--import tsx` is not passed on).
    execArgv: [],
    // The thread's own JavaScript is small (PGlite's memory is WebAssembly, outside this heap): a
    // small young generation keeps it from holding tens of MB it rarely needs.
    resourceLimits: { maxYoungGenerationSizeMb: YOUNG_GENERATION_MB },
  });

  let exited = false;
  let failure: Error | null = null;
  const waiting = new Map<number, { resolve: (a: Extract<ControlAnswer, { type: 'done' }>) => void; reject: (e: Error) => void }>();
  const exit = new Promise<void>((resolve) => worker.once('exit', () => resolve()));
  const ready = new Promise<void>((resolve, reject) => {
    worker.on('message', (a: ControlAnswer) => {
      if (a.type === 'ready') resolve();
      else if (a.type === 'failed') reject(new Error(`Cannot open the embedded database: ${a.message}`));
      else {
        waiting.get(a.id)?.resolve(a);
        waiting.delete(a.id);
      }
    });
    worker.on('error', (err) => {
      failure = err;
      reject(err);
    });
    worker.once('exit', (code) => {
      exited = true;
      const err = failure ?? new Error(`the embedded database thread stopped (exit code ${code})`);
      reject(err);
      for (const w of waiting.values()) w.reject(err);
      waiting.clear();
    });
  });
  try {
    await ready;
  } catch (err) {
    await worker.terminate();
    throw err;
  }

  let next = 0;
  const control = (m: Omit<Extract<ControlMessage, { id: number }>, 'id'>) =>
    new Promise<Extract<ControlAnswer, { type: 'done' }>>((resolve, reject) => {
      if (exited) return reject(failure ?? new Error('the embedded database thread has stopped'));
      const id = ++next;
      waiting.set(id, { resolve, reject });
      worker.postMessage({ ...m, id });
    });

  const openPort = (): MessagePort => {
    if (exited) throw failure ?? new Error('the embedded database thread has stopped');
    const { port1, port2 } = new MessageChannel();
    worker.postMessage({ type: 'connect', port: port2 } satisfies ControlMessage, [port2]);
    return port1;
  };

  const pool = new pg.Pool({
    max: 1,
    Client: NamingClient as unknown as typeof pg.Client,
    // Never dropped for idleness: the connection costs nothing to keep, and PGlite has only the one session.
    idleTimeoutMillis: 0,
    user: 'postgres',
    database: 'postgres',
    ssl: false,
    stream: () => new ThreadSocket(openPort),
  });
  pool.on('error', (err) => console.error(`Embedded database connection lost (${err.message}); the pool will reconnect.`));

  let closing: Promise<void> | null = null;
  return {
    pool,
    async ping() {
      const workingNow = () => Atomics.load(flags, BUSY) === 1 && Date.now() - epoch - Atomics.load(flags, SINCE) < BUSY_HEALTHY_MS;
      if (workingNow()) return;
      const answered = control({ type: 'ping' }).then((a) => {
        if (!a.ok) throw new Error(a.message ?? 'the embedded database did not answer');
      });
      // The probe waits behind statements that reached the thread before it (a 2 MB insert takes
      // ~0.1 s there). The thread beginning one of them meanwhile is as good an answer: it signals
      // it through the shared flag (Atomics.notify), so the probe does not wait for the statement's end.
      const begun = new Promise<void>((resolve) => {
        const w = waitAsync(flags, BUSY, 0, BUSY_HEALTHY_MS * 5);
        if (w.async) void w.value.then((r) => r === 'ok' && workingNow() && resolve());
      });
      answered.catch(() => {}); // a failure after the thread was seen working is not this probe's
      await Promise.race([answered, begun]);
    },
    async dump() {
      const a = await control({ type: 'dump' });
      if (!a.ok || !a.dump) throw new Error(a.message ?? 'the embedded database could not be dumped');
      return new Blob([a.dump]);
    },
    close() {
      closing ??= (async () => {
        await pool.end();
        if (!exited) {
          const a = await control({ type: 'close' });
          if (!a.ok) {
            await worker.terminate();
            throw new Error(`Closing the embedded database: ${a.message ?? 'failed'}`);
          }
        }
        // The thread ends by itself once PGlite is closed; a stuck one is stopped.
        let timer: NodeJS.Timeout | undefined;
        await Promise.race([exit, new Promise<void>((resolve) => (timer = setTimeout(() => void worker.terminate().then(() => resolve()), 5000)))]);
        clearTimeout(timer);
      })();
      return closing;
    },
  };
}
