/** The one error type of the server: services throw it, the error middleware turns it into the contract shape. */
import type { ErrorCode } from '../shared/api/common.ts';

export interface AppErrorExtra {
  /** Per-field messages of a validation error (`path.to.field` → message). */
  fields?: Record<string, string>;
  /** Seconds until a rate-limited request may be retried (also sent as Retry-After). */
  retryAfterSeconds?: number;
  /** Extra top-level members of the response body (e.g. `current` on a version conflict). */
  body?: Record<string, unknown>;
}

export class AppError extends Error {
  readonly status: number;
  readonly code: ErrorCode;
  readonly extra: AppErrorExtra;

  constructor(status: number, code: ErrorCode, message: string, extra: AppErrorExtra = {}) {
    super(message);
    this.name = 'AppError';
    this.status = status;
    this.code = code;
    this.extra = extra;
  }
}

/** 404 with the wording used for every missing or foreign record, so existence never leaks. */
export function notFound(what = 'Study'): AppError {
  return new AppError(404, 'not-found', `${what} not found.`);
}

/** A 400 validation error naming one field. */
export function fieldError(field: string, message: string): AppError {
  return new AppError(400, 'validation', message, { fields: { [field]: message } });
}

const UUID_RE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** True for a syntactically valid UUID (a malformed id in a URL is answered with 404, never a database error). */
export function isUuid(s: string): boolean {
  return UUID_RE.test(s);
}

/** The SQLSTATE of a database error, also when wrapped by the ORM (DrizzleQueryError keeps it in `cause`). */
export function databaseErrorCode(err: unknown): string | undefined {
  for (let e = err, i = 0; e && typeof e === 'object' && i < 5; e = (e as { cause?: unknown }).cause, i++) {
    const code = (e as { code?: unknown }).code;
    if (typeof code === 'string' && /^[0-9A-Z]{5}$/.test(code)) return code;
  }
  return undefined;
}

/** True for a unique-key violation (two requests racing to create the same thing). */
export function isUniqueViolation(err: unknown): boolean {
  return databaseErrorCode(err) === '23505';
}
