/**
 * A stand-in for the network boundary in component tests: `fetch` answers from handlers that
 * return contract-shaped JSON (api.md). The real server is exercised by the server and browser tests.
 */
import { vi } from 'vitest';

export interface FakeRequest {
  method: string;
  url: URL;
  body: unknown;
}

export interface FakeResponse {
  status?: number;
  body?: unknown;
  headers?: Record<string, string>;
}

export type Handler = (req: FakeRequest) => FakeResponse | undefined;

/** Installs a fetch that routes `METHOD /path` to handlers; unmatched calls answer 404 not-found. Returns the call log. */
export function stubApi(routes: Record<string, Handler>) {
  const calls: FakeRequest[] = [];
  const fetchStub = vi.fn(async (input: RequestInfo | URL, init?: RequestInit) => {
    const url = new URL(typeof input === 'string' ? input : input instanceof URL ? input.href : input.url, 'http://wyeward.test');
    const method = (init?.method ?? 'GET').toUpperCase();
    const body = typeof init?.body === 'string' ? JSON.parse(init.body) : undefined;
    const req = { method, url, body };
    calls.push(req);
    let answer: FakeResponse | undefined;
    for (const [key, handler] of Object.entries(routes)) {
      const [m, pattern] = key.split(' ');
      if (m !== method) continue;
      const re = new RegExp(`^${pattern.replace(/:[a-zA-Z]+/g, '[^/]+')}$`);
      if (re.test(url.pathname)) {
        answer = handler(req);
        if (answer) break;
      }
    }
    answer ??= { status: 404, body: { error: { code: 'not-found', message: 'Not found' } } };
    const status = answer.status ?? 200;
    return new Response(status === 204 || answer.body === undefined ? null : JSON.stringify(answer.body), {
      status,
      headers: { 'Content-Type': 'application/json', ...answer.headers },
    });
  });
  vi.stubGlobal('fetch', fetchStub);
  return { calls, fetch: fetchStub };
}

/** The contract's error body. */
export function apiError(status: number, code: string, message: string, extra: Record<string, unknown> = {}): FakeResponse {
  return { status, body: { error: { code, message, ...extra } } };
}
