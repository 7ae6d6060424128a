/**
 * Graceful shutdown of the HTTP server: stop accepting connections, let every request in flight
 * finish (answers sent from then on carry `Connection: close`, so keep-alive clients reconnect to
 * another instance), close keep-alive connections as they fall idle, and only after `timeoutMs`
 * cut what is left.
 */
import type { Server, ServerResponse } from 'node:http';

interface Tracked {
  running: Set<ServerResponse>;
  draining: boolean;
}

const tracked = new WeakMap<Server, Tracked>();

/** Keeps count of the requests in progress on `server`, for a later drain. Call once, before listening. */
export function trackRequests(server: Server): void {
  const t: Tracked = { running: new Set(), draining: false };
  tracked.set(server, t);
  server.on('request', (_req, res) => {
    t.running.add(res);
    if (t.draining) res.setHeader('Connection', 'close');
    res.on('close', () => t.running.delete(res));
  });
}

/** Requests in progress on a tracked server. */
export function requestsInFlight(server: Server): number {
  return tracked.get(server)?.running.size ?? 0;
}

/**
 * Drains `server` (tracked with trackRequests); resolves with how many requests were cut when the
 * time ran out (0 when every request finished).
 */
export function drainServer(server: Server, timeoutMs: number): Promise<number> {
  const t = tracked.get(server) ?? { running: new Set<ServerResponse>(), draining: false };
  t.draining = true;
  for (const res of t.running) if (!res.headersSent) res.setHeader('Connection', 'close');
  return new Promise((resolve) => {
    let done = false;
    const finish = () => {
      if (done) return;
      done = true;
      clearTimeout(timer);
      clearInterval(idle);
      const cut = t.running.size;
      server.closeAllConnections();
      resolve(cut);
    };
    const timer = setTimeout(finish, timeoutMs);
    const idle = setInterval(() => {
      server.closeIdleConnections();
      if (t.running.size === 0) finish();
    }, 20);
    server.close(() => finish());
    server.closeIdleConnections();
  });
}

/**
 * How long an idle keep-alive connection stays open. Node's default (5 s) is shorter than the idle
 * time of most clients in front of the app (undici/fetch keeps connections 4 s at most, but load
 * balancers and proxies 60 s, Node's http.Agent without a timeout for ever): the server then closes
 * connections that a client is about to reuse, and a request written at that moment gets no answer
 * (ECONNRESET, EPIPE: the likely cause of the requests without an answer in the load and import
 * benchmarks on a loaded machine, where timers run late). Longer than a
 * proxy's 60 s, so the client side closes first; headersTimeout must exceed it.
 */
export const KEEP_ALIVE_TIMEOUT_MS = 65_000;

/** Applies KEEP_ALIVE_TIMEOUT_MS (and a headersTimeout above it) to `server`. */
export function keepIdleConnections(server: Server): void {
  server.keepAliveTimeout = KEEP_ALIVE_TIMEOUT_MS;
  server.headersTimeout = KEEP_ALIVE_TIMEOUT_MS + 5_000;
}
