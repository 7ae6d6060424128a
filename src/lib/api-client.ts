/**
 * The one way the browser talks to Wyeward's API: same-origin fetch with the session cookie,
 * JSON in and out, and every non-2xx answer turned into a typed ApiError carrying the
 * contract's error shape `{ error: { code, message, fields? } }`.
 */

/** The error shape every API route returns (api contract, "Errors"). */
export interface ApiErrorBody {
  code: string;
  message: string;
  fields?: Record<string, string>;
  retryAfterSeconds?: number;
  [extra: string]: unknown;
}

/** A failed API call: HTTP status plus the contract's code, message and field messages. */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly fields: Record<string, string>;
  /** Seconds to wait before retrying (429 only), from the body or the Retry-After header. */
  readonly retryAfterSeconds: number | undefined;
  /** The whole parsed response body, for codes that carry more (e.g. `current` on a version conflict). */
  readonly body: unknown;

  constructor(status: number, error: ApiErrorBody, body: unknown, retryAfterSeconds?: number) {
    super(error.message);
    this.name = 'ApiError';
    this.status = status;
    this.code = error.code;
    this.fields = error.fields ?? {};
    this.retryAfterSeconds = retryAfterSeconds;
    this.body = body;
  }
}

/** True when `e` is an ApiError with this HTTP status. */
export function isApiError(e: unknown, status?: number): e is ApiError {
  return e instanceof ApiError && (status === undefined || e.status === status);
}

type Query = Record<string, string | number | boolean | undefined | null>;

interface RequestOptions {
  query?: Query;
  body?: unknown;
  signal?: AbortSignal;
}

function withQuery(path: string, query?: Query): string {
  if (!query) return path;
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value === undefined || value === null || value === '') continue;
    params.set(key, String(value));
  }
  const qs = params.toString();
  return qs ? `${path}?${qs}` : path;
}

function readErrorBody(status: number, statusText: string, body: unknown): ApiErrorBody {
  if (body && typeof body === 'object' && 'error' in body) {
    const err = (body as { error: unknown }).error;
    if (err && typeof err === 'object' && typeof (err as ApiErrorBody).message === 'string') {
      const e = err as ApiErrorBody;
      return { ...e, code: typeof e.code === 'string' ? e.code : 'unknown' };
    }
  }
  // A proxy or a crash page rather than our API: still give the user words, not a blank.
  return {
    code: status >= 500 ? 'internal' : 'unknown',
    message: status >= 500
      ? `The server could not complete the request (HTTP ${status}). Try again in a moment.`
      : `The request failed (HTTP ${status}${statusText ? ` ${statusText}` : ''}).`,
  };
}

async function request<T>(method: string, path: string, opts: RequestOptions = {}): Promise<T> {
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (opts.body !== undefined) headers['Content-Type'] = 'application/json';
  let res: Response;
  try {
    res = await fetch(withQuery(path, opts.query), {
      method,
      headers,
      credentials: 'same-origin',
      body: opts.body === undefined ? undefined : JSON.stringify(opts.body),
      signal: opts.signal,
    });
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === 'AbortError') throw cause;
    throw new ApiError(0, { code: 'network', message: 'Cannot reach the Wyeward server. Check the connection and try again.' }, null);
  }
  if (res.status === 204) return undefined as T;
  const text = await res.text();
  let body: unknown = null;
  if (text) {
    try {
      body = JSON.parse(text);
    } catch {
      body = text;
    }
  }
  if (!res.ok) throw responseError(res, body);
  return body as T;
}

/** The ApiError of a non-2xx answer and its parsed body (for fetchers that read the response themselves). */
export function responseError(res: Response, body: unknown): ApiError {
  const error = readErrorBody(res.status, res.statusText, body);
  const header = Number(res.headers.get('Retry-After'));
  const retry = typeof error.retryAfterSeconds === 'number'
    ? error.retryAfterSeconds
    : Number.isFinite(header) && header > 0 ? header : undefined;
  return new ApiError(res.status, error, body, retry);
}

/** JSON API calls; paths start with `/api`. */
export const api = {
  get: <T>(path: string, opts?: Omit<RequestOptions, 'body'>) => request<T>('GET', path, opts),
  post: <T>(path: string, body?: unknown, opts?: RequestOptions) => request<T>('POST', path, { ...opts, body }),
  patch: <T>(path: string, body?: unknown, opts?: RequestOptions) => request<T>('PATCH', path, { ...opts, body }),
  delete: <T = void>(path: string, opts?: RequestOptions) => request<T>('DELETE', path, opts),
};
