/**
 * The one error middleware: every failure leaves as `{ error: { code, message, … } }`.
 * Bad input is always a 4xx; only real bugs are 500 (and logged). A database refusal that input
 * caused (a value the column cannot hold, a unique key taken by a concurrent request) is a 4xx too.
 * The log line names the request id, method, route pattern, status and error codes, never the
 * request body, the query string or a database query's parameters (see logError).
 */
import type { ErrorRequestHandler, Request } from 'express';
import { z } from 'zod';
import type { ErrorBody, ErrorCode } from '../shared/api/common.ts';
import { AppError, databaseErrorCode } from './errors.ts';
import { issueWords } from './issue-words.ts';
import { logEvent } from './log.ts';

/** `path.to.field` → first message, from a zod error. */
export function zodFields(err: z.ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of err.issues) {
    const key = issue.path.length > 0 ? issue.path.map(String).join('.') : '_';
    fields[key] ??= issue.message;
  }
  return fields;
}

/** Errors raised by express.json (body-parser) carry `type` and `status`. */
interface BodyParserError {
  type?: string;
  status?: number;
  statusCode?: number;
  limit?: number;
}

/** Contract codes for the 4xx statuses Express or body-parser may raise on their own. */
const STATUS_CODES: Partial<Record<number, ErrorCode>> = {
  401: 'unauthenticated',
  403: 'forbidden',
  404: 'not-found',
  409: 'conflict',
  413: 'payload-too-large',
  415: 'unsupported-media-type',
  429: 'rate-limited',
};

/**
 * PostgreSQL error classes caused by the request's values rather than by the code (SQLSTATE,
 * PostgreSQL manual appendix A): data exceptions (22…) and integrity violations (23…).
 */
function databaseRefusal(code: string | undefined): { status: number; code: ErrorCode; message: string } | null {
  if (!code) return null;
  if (code === '23505') return { status: 409, code: 'conflict', message: 'This already exists (another request just created it).' };
  if (code.startsWith('23')) return { status: 409, code: 'conflict', message: 'This conflicts with another change made at the same time; reload and try again.' };
  if (code.startsWith('22')) return { status: 400, code: 'validation', message: 'The request contains a value that cannot be stored.' };
  if (code === '54001') return { status: 400, code: 'validation', message: 'The request is nested too deeply to be stored.' };
  return null;
}

/** The route pattern of a request (`/api/studies/:id`), never its concrete URL or query string. */
export function routeOf(req: Request): string {
  const pattern = (req.route as { path?: unknown } | undefined)?.path;
  return typeof pattern === 'string' ? `${req.baseUrl}${pattern}` : `${req.baseUrl || ''}(no route)`;
}

/** The stack of an error without its message line (messages may quote values, e.g. a database query's parameters). */
function framesOf(err: unknown): string[] {
  const stack = err instanceof Error && typeof err.stack === 'string' ? err.stack : '';
  return stack
    .split('\n')
    .filter((l) => /^\s+at /.test(l))
    .slice(0, 12)
    .map((l) => l.trim());
}

function logError(req: Request, requestId: string, status: number, err: unknown) {
  logEvent('error', {
    requestId,
    method: req.method,
    route: routeOf(req),
    status,
    error: err instanceof Error ? err.name : typeof err,
    ...(databaseErrorCode(err) ? { sqlstate: databaseErrorCode(err) } : {}),
    ...(status >= 500 ? { at: framesOf(err) } : {}),
  });
}

export const errorHandler: ErrorRequestHandler = (err, req, res, next) => {
  if (res.headersSent) return next(err);
  const send = (status: number, error: ErrorBody['error'], extra: Record<string, unknown> = {}) =>
    res.status(status).json({ error, ...extra });

  if (err instanceof AppError) {
    const { fields, retryAfterSeconds, body } = err.extra;
    if (retryAfterSeconds !== undefined) res.setHeader('Retry-After', String(retryAfterSeconds));
    return send(
      err.status,
      { code: err.code, message: err.message, ...(fields ? { fields } : {}), ...(retryAfterSeconds !== undefined ? { retryAfterSeconds } : {}) },
      body,
    );
  }
  if (err instanceof z.ZodError) {
    // In the words of the form (issue-words.ts): a label people see, never a path or a validator's phrasing.
    const fields: Record<string, string> = {};
    let message = '';
    for (const issue of err.issues) {
      const key = issue.path.length > 0 ? issue.path.map(String).join('.') : '_';
      if (fields[key] !== undefined) continue;
      const said = issueWords(issue, req.originalUrl, req.body);
      fields[key] = said.text;
      message ||= said.message;
    }
    return send(400, { code: 'validation', message: message || 'The request is not valid.', fields });
  }
  const bp = (err ?? {}) as BodyParserError;
  if (bp.type === 'entity.parse.failed') {
    return send(400, { code: 'validation', message: 'The request body is not valid JSON.', fields: { _: 'Malformed JSON' } });
  }
  if (bp.type === 'entity.too.large') {
    const mb = bp.limit ? ` (limit ${(bp.limit / 1024 / 1024).toFixed(0)} MB)` : '';
    return send(413, { code: 'payload-too-large', message: `The request body is too large${mb}.` });
  }
  // Other client errors raised by Express itself: an undecodable %-escape in the path, an unsupported
  // charset or encoding of the body. They carry a 4xx status; keep it and use the contract's shape.
  const status = bp.status ?? bp.statusCode;
  if (typeof status === 'number' && status >= 400 && status < 500) {
    const code = STATUS_CODES[status] ?? 'validation';
    const message =
      err instanceof URIError
        ? 'The address contains an invalid %-escape.'
        : bp.type
          ? `The request could not be read (${bp.type.replace(/\./g, ' ')}).`
          : 'The request could not be read.';
    return send(status, { code, message });
  }
  const requestId = String(res.locals.requestId ?? '-');
  const refusal = databaseRefusal(databaseErrorCode(err));
  if (refusal) {
    logError(req, requestId, refusal.status, err);
    return send(refusal.status, { code: refusal.code, message: refusal.message });
  }
  logError(req, requestId, 500, err);
  return send(500, { code: 'internal', message: `Something went wrong on the server; it has been logged (reference ${requestId}).` });
};
