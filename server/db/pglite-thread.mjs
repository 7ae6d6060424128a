/**
 * The embedded database's own thread (started by pglite-client.ts). PGlite executes every statement
 * synchronously in its WASM module; here that happens off the request thread. The request thread
 * talks to it with node-postgres, as it talks to a PostgreSQL server: each connection is a
 * MessagePort carrying the PostgreSQL wire protocol, and this thread plays the server's part —
 * it gathers the bytes into whole messages (as a socket server would) and hands them to PGlite's
 * `execProtocolRawStream`, sending the answer back. PGlite has one session, so connections take turns
 * (the pool holds one; a connection that goes away mid-transaction is rolled back).
 *
 * `state` (shared memory) tells the request thread, without a round trip, whether a statement is
 * running and since when (the health check reads it; see pglite-client.ts).
 *
 * Plain JavaScript on purpose (types in JSDoc, the messages' in pglite-messages.ts): the thread starts
 * without a TypeScript loader, which would otherwise be loaded into it for this one file (tsx and
 * its compiled copies: ~14 MB of the idle server's memory, and start-up time).
 */
import { parentPort, workerData } from 'node:worker_threads';
import { PGlite } from '@electric-sql/pglite';

/** @typedef {import('node:worker_threads').MessagePort} MessagePort */
/** @typedef {import('./pglite-messages.ts').ThreadData} ThreadData */
/** @typedef {import('./pglite-messages.ts').ControlMessage} ControlMessage */
/** @typedef {import('./pglite-messages.ts').ControlAnswer} ControlAnswer */


/** Answers of at least this many bytes are moved to the request thread (transferred), smaller ones copied. */
const MOVE_BYTES = 16 * 1024;

const SSL_REQUEST = 80877103;
const GSS_REQUEST = 80877104;
const CANCEL_REQUEST = 80877102;

/** @type {ThreadData} */
const data = workerData;
const state = new Int32Array(data.state);
const { busy: BUSY, since: SINCE } = data.slots;
const port = /** @type {import('node:worker_threads').MessagePort} */ (parentPort);

/** One statement (or batch of protocol messages) at a time, in arrival order, whatever the connection. */
/** @type {Promise<unknown>} */
let queue = Promise.resolve();
/**
 * @template T
 * @param {() => Promise<T>} job
 * @returns {Promise<T>}
 */
function serially(job) {
  const next = queue.then(job);
  queue = next.catch(() => {});
  return next;
}

/** A simple-protocol Query message. @param {string} text @returns {Uint8Array} */
function queryMessage(text) {
  const body = Buffer.from(`${text}\0`, 'utf8');
  const m = Buffer.alloc(5 + body.length);
  m[0] = 0x51; // 'Q'
  m.writeInt32BE(4 + body.length, 1);
  body.copy(m, 5);
  return m;
}

/** Whether an answer holds an ErrorResponse, and the transaction status of its closing ReadyForQuery ('' when it has none). */
/** @param {Uint8Array} reply @returns {{ error: boolean, status: string }} */
function inspect(reply) {
  const b = Buffer.from(reply.buffer, reply.byteOffset, reply.byteLength);
  let error = false;
  let status = '';
  for (let i = 0; i + 5 <= b.length; ) {
    const type = b[i];
    const len = b.readInt32BE(i + 1);
    if (type === 0x45) error = true; // 'E'
    status = type === 0x5a && i + 5 < b.length ? String.fromCharCode(b[i + 5]) : ''; // 'Z'
    i += 1 + len;
  }
  return { error, status };
}

/** @type {PGlite} */
let pglite;
/** The session's transaction status after the last ReadyForQuery ('I' idle, 'T' in a transaction, 'E' failed). */
let txStatus = 'I';
/** True when the last answer ended with ReadyForQuery: nothing half-sent (a parse without its sync) is pending. */
let atBoundary = true;
/** The connection whose messages PGlite executed last. */
/** @type {MessagePort | null} */
let owner = null;
/** Connections started so far (the first finds no prepared statements; later ones must not find their predecessors'). */
let startups = 0;

/** @param {Uint8Array} message @returns {Promise<Uint8Array>} */
async function exec(message) {
  Atomics.store(state, SINCE, Date.now() - data.epoch);
  Atomics.store(state, BUSY, 1);
  Atomics.notify(state, BUSY); // a health probe waiting for the thread to show it works (pglite-client.ts)
  try {
    // The streaming form: PGlite's execProtocolRaw (0.5.17) also parses every answer into a list of
    // results it never empties (about 0.5 kB of heap per statement, never freed: 60 MB after ten
    // minutes of a busy team); this one hands over the bytes only. Each chunk is a view of WASM
    // memory: copied at once.
    /** @type {Uint8Array[]} */
    const parts = [];
    await pglite.execProtocolRawStream(message, { onRawData: (chunk) => parts.push(chunk.slice()) });
    const reply = parts.length === 1 ? parts[0] : Buffer.concat(parts);
    const { status } = inspect(reply);
    atBoundary = status !== '';
    if (status) txStatus = status;
    return reply;
  } finally {
    Atomics.store(state, BUSY, 0);
  }
}

/** Leaves no transaction open behind a connection that has gone (so the next one starts clean). */
async function resetSession() {
  if (txStatus !== 'I' || !atBoundary) {
    if (!atBoundary) await exec(Buffer.from([0x53, 0, 0, 0, 4])); // Sync: ends a half-sent extended query
    if (txStatus !== 'I') await exec(queryMessage('rollback'));
  }
}

/** One connection: bytes in, whole messages to PGlite, answers out. */
/** @param {MessagePort} conn */
function serve(conn) {
  let pending = Buffer.alloc(0);
  let started = false;
  let closed = false;
  const finish = () => {
    if (closed) return;
    closed = true;
    conn.close();
    // Only if no other connection has spoken since (its session must not be touched).
    void serially(async () => {
      if (owner === conn) await resetSession();
    }).catch(() => {});
  };
  /** @param {Uint8Array} reply */
  const send = (reply) => {
    // A small answer is copied: moving an ArrayBuffer to another thread costs more than copying a few kB.
    if (!closed && reply.byteLength > 0) conn.postMessage(reply, reply.byteLength >= MOVE_BYTES ? [reply.buffer] : []);
  };
  const take = () => {
    /** @type {Buffer[]} */
    const batches = [];
    /** @type {Buffer | null} */
    let startupMessage = null;
    let terminate = false;
    for (;;) {
      if (!started) {
        if (pending.length < 8) break;
        const len = pending.readInt32BE(0);
        if (pending.length < len) break;
        const code = pending.readInt32BE(4);
        const msg = pending.subarray(0, len);
        pending = pending.subarray(len);
        if (code === SSL_REQUEST || code === GSS_REQUEST) {
          send(Uint8Array.of(0x4e)); // 'N': no encryption on a port inside the process
          continue;
        }
        if (code === CANCEL_REQUEST) continue;
        started = true;
        startupMessage = msg;
        batches.push(msg); // the StartupMessage: PGlite answers it like a server (authentication ok, parameters, ready)
        continue;
      }
      // Every whole message available, as one batch (a query's parse, bind, execute and sync arrive together).
      let end = 0;
      while (end + 5 <= pending.length) {
        const len = pending.readInt32BE(end + 1);
        if (end + 1 + len > pending.length) break;
        if (pending[end] === 0x58) {
          terminate = true; // 'X': the client is leaving
          break;
        }
        end += 1 + len;
      }
      if (end > 0) batches.push(pending.subarray(0, end));
      pending = terminate ? Buffer.alloc(0) : pending.subarray(end);
      break;
    }
    for (const bytes of batches) {
      const startup = bytes === startupMessage;
      serially(async () => {
        // node-postgres names prepared statements per connection (pglite-client.ts): a new connection
        // begins without any, as on a server, so the previous connection's are dropped first.
        if (startup && startups++ > 0) await exec(queryMessage('deallocate all'));
        owner = conn;
        return exec(bytes);
      }).then(send, (/** @type {unknown} */ err) => {
        // PGlite itself failed (not an SQL error, which comes back as an ErrorResponse): drop the connection.
        if (!closed) conn.postMessage({ error: err instanceof Error ? err.message : String(err) });
        finish();
      });
    }
    if (terminate) finish();
  };
  conn.on('message', (/** @type {Uint8Array | Uint8Array[]} */ m) => {
    if (closed) return;
    // One batch of messages: one array, or its parts (large ones moved as they were written, pglite-client.ts).
    const parts = Array.isArray(m) ? m : [m];
    const first = parts[0];
    pending =
      pending.length === 0 && parts.length === 1 ? Buffer.from(first.buffer, first.byteOffset, first.byteLength) : Buffer.concat([pending, ...parts]);
    take();
  });
  conn.on('close', finish);
}

/** The health probe: runs `select 1` when the session is between statements (even inside a transaction). */
/** @returns {Promise<{ ok: boolean, message?: string }>} */
async function ping() {
  if (!atBoundary || txStatus === 'E') return { ok: true }; // a client's statement is half-sent: the thread answering is the proof
  const { error } = inspect(await exec(queryMessage('select 1')));
  return error ? { ok: false, message: 'select 1 failed' } : { ok: true };
}

/** @param {ControlAnswer} a @param {ArrayBuffer[]} [transfer] */
function answer(a, transfer = []) {
  port.postMessage(a, transfer);
}

port.on('message', (/** @type {ControlMessage} */ m) => {
  if (m.type === 'connect') return serve(m.port);
  const job =
    m.type === 'ping'
      ? ping
      : m.type === 'dump'
        ? async () => ({ ok: true, dump: await (await pglite.dumpDataDir('gzip')).arrayBuffer() })
        : async () => {
            await pglite.close();
            return { ok: true };
          };
  serially(job).then(
    (/** @type {{ ok: boolean, message?: string, dump?: ArrayBuffer }} */ r) => {
      answer({ type: 'done', id: m.id, ...r }, r.dump ? [r.dump] : []);
      if (m.type === 'close') port.close();
    },
    (/** @type {unknown} */ err) => answer({ type: 'done', id: m.id, ok: false, message: err instanceof Error ? err.message : String(err) }),
  );
});

async function open() {
  try {
    pglite = new PGlite({ dataDir: data.dataDir, loadDataDir: data.loadDataDir ? new Blob([data.loadDataDir]) : undefined, postgresqlconf: data.settings });
    await pglite.waitReady;
    answer({ type: 'ready' });
  } catch (err) {
    answer({ type: 'failed', message: err instanceof Error ? err.message : String(err) });
    port.close();
  }
}
void open();
