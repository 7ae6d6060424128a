/**
 * The API's input boundary: every piece of text a request carries (path, query string, JSON body)
 * is checked before a route, a service, the database or the engine sees it. NUL characters and lone
 * UTF-16 surrogates (which PostgreSQL refuses) and JSON nested deeper than JSON_MAX_DEPTH are
 * answered with 400 and a field message. Cookies are read only by the session middleware, which
 * treats a malformed session cookie as no session; uploaded file names are cleaned where they are
 * stored (services/attachments.ts).
 */
import type { RequestHandler } from 'express';
import { BAD_TEXT_MESSAGE, findJsonProblem, isBadText } from '../shared/api/limits.ts';
import { AppError } from './errors.ts';
import { fieldWords } from './issue-words.ts';

/** 400 naming the field by the label people see (issue-words.ts); `fields` keeps the path for the client. */
function refuse(field: string, message: string, url: string): AppError {
  if (field === '_') return new AppError(400, 'validation', `The request body: ${message.toLowerCase()}.`, { fields: { [field]: message } });
  const said = fieldWords(field, message, url);
  return new AppError(400, 'validation', `${said.message}.`, { fields: { [field]: message } });
}

/** Checks the path and query string; mount before the routes. */
export const guardUrl: RequestHandler = (req, _res, next) => {
  let path: string;
  try {
    path = decodeURIComponent(req.path);
  } catch {
    throw new AppError(400, 'validation', 'The address contains an invalid %-escape.');
  }
  if (isBadText(path)) throw refuse('path', BAD_TEXT_MESSAGE, req.originalUrl);
  const q = findJsonProblem(req.query, 8);
  if (q) throw refuse(q.path, q.message, req.originalUrl);
  next();
};

/**
 * Checks a parsed JSON body (mount right after express.json). An uploaded study file (bytes or
 * text, on the import path only) is checked where it is parsed, in the work pool
 * (server/work/import-file.ts, the same checks): here it would cost the request thread a walk of
 * up to 2 MB.
 */
export const guardBody: RequestHandler = (req, _res, next) => {
  if (req.body !== undefined && !Buffer.isBuffer(req.body) && typeof req.body !== 'string') {
    const p = findJsonProblem(req.body);
    if (p) throw refuse(p.path, p.message, req.originalUrl);
  }
  next();
};
