/** Graceful shutdown (server/shutdown.ts): requests in flight finish, new connections are refused, a request that never ends is cut at the limit. */
import { createServer, get, type IncomingMessage, type Server } from 'node:http';
import { describe, expect, it } from 'vitest';
import { connect } from 'node:net';
import { drainServer, KEEP_ALIVE_TIMEOUT_MS, keepIdleConnections, requestsInFlight, trackRequests } from '../../server/shutdown.ts';

/** A server whose /slow requests wait until released. */
async function slowServer() {
  let release!: () => void;
  const released = new Promise<void>((r) => (release = r));
  let started!: () => void;
  const inHandler = new Promise<void>((r) => (started = r));
  const server: Server = createServer();
  trackRequests(server);
  server.on('request', (req, res) => {
    if (req.url === '/slow') {
      started();
      void released.then(() => res.end('finished'));
    } else res.end('quick');
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : 0;
  return { server, port, release, inHandler };
}

function fetchText(port: number, p: string): Promise<{ status: number; body: string; connection?: string }> {
  return new Promise((resolve, reject) => {
    get({ host: '127.0.0.1', port, path: p }, (res: IncomingMessage) => {
      let body = '';
      res.on('data', (c) => (body += c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body, connection: res.headers.connection }));
    }).on('error', reject);
  });
}

describe('drainServer', () => {
  it('lets a request in flight finish (answered with Connection: close) and refuses new connections meanwhile', async () => {
    const { server, port, release, inHandler } = await slowServer();
    const pending = fetchText(port, '/slow');
    await inHandler;
    expect(requestsInFlight(server)).toBe(1);
    const drained = drainServer(server, 60_000);
    const refused = await fetchText(port, '/quick').then(
      () => null,
      (e: NodeJS.ErrnoException) => e.code,
    );
    expect(refused).toBe('ECONNREFUSED');
    release();
    expect(await pending).toEqual({ status: 200, body: 'finished', connection: 'close' });
    expect(await drained).toBe(0);
  });

  it('cuts a request that has not finished when the time is up, and says how many', async () => {
    const { server, port, release, inHandler } = await slowServer();
    const pending = fetchText(port, '/slow').then(
      () => 'answered',
      () => 'cut',
    );
    await inHandler;
    expect(await drainServer(server, 50)).toBe(1);
    expect(await pending).toBe('cut');
    release();
  });
});

describe('keepIdleConnections', () => {
  it('keeps an idle keep-alive connection open past Node’s default 5 s, so a client reusing it gets its answer', async () => {
    const server = createServer((_req, res) => res.end('ok'));
    keepIdleConnections(server);
    expect(server.keepAliveTimeout).toBe(KEEP_ALIVE_TIMEOUT_MS);
    expect(server.headersTimeout).toBeGreaterThan(KEEP_ALIVE_TIMEOUT_MS);
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
    const { port } = server.address() as { port: number };
    const socket = connect(port, '127.0.0.1');
    let received = '';
    socket.setEncoding('utf8');
    socket.on('data', (d: string) => (received += d));
    const answers = () => received.split('HTTP/1.1 200').length - 1;
    const ask = () => socket.write(`GET / HTTP/1.1\r\nHost: 127.0.0.1:${port}\r\nConnection: keep-alive\r\n\r\n`);
    const until = async (n: number) => {
      for (let i = 0; i < 200 && answers() < n; i++) await new Promise((r) => setTimeout(r, 25));
    };
    ask();
    await until(1);
    expect(answers()).toBe(1);
    expect(received).toContain(`Keep-Alive: timeout=${KEEP_ALIVE_TIMEOUT_MS / 1000}`);
    await new Promise((r) => setTimeout(r, 6000)); // idle longer than Node's default keep-alive (5 s)
    expect(socket.destroyed).toBe(false);
    ask();
    await until(2);
    expect(answers()).toBe(2);
    socket.destroy();
    await new Promise((r) => server.close(r));
  }, 20_000);
});
