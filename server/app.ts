/** Builds the Express app without listening: used by index.ts, dev.ts and the supertest tests. */
import { randomUUID } from 'node:crypto';
import type { IncomingMessage } from 'node:http';
import express, { type Express } from 'express';
import { originCheck, sessionMiddleware } from './auth/index.ts';
import { createLucia } from './auth/lucia.ts';
import { createSignInLimiter } from './auth/rate-limit.ts';
import type { Config } from './config.ts';
import { pingDb, type Db } from './db/index.ts';
import { errorHandler } from './error-handler.ts';
import { guardBody, guardUrl } from './input-guard.ts';
import { healthRoutes, type HealthCheck } from './health.ts';
import { securityHeaders } from './security-headers.ts';
import { AppError } from './errors.ts';
import type { Mailer } from './mail/index.ts';
import { bucketHealthCheck, type ObjectStore } from './storage/objects.ts';
import { auditRoutes } from './routes/audit.ts';
import { authRoutes } from './routes/auth.ts';
import type { RouteContext } from './routes/context.ts';
import { mailRoutes } from './routes/mail.ts';
import { notificationRoutes, templateRoutes } from './routes/notifications.ts';
import { reportRoutes } from './routes/report.ts';
import { reviewRoutes } from './routes/review.ts';
import { studyRoutes } from './routes/studies.ts';
import { balancingRoutes } from './routes/balancing.ts';
import { sweepRoutes } from './routes/sweeps.ts';
import { inviteRoutes, teamRoutes } from './routes/team.ts';

export interface AppDeps {
  db: Db;
  config: Config;
  mailer: Mailer;
  /** The bucket of stored files. */
  objects: ObjectStore;
  /** Adds the client (static dist/ or vite middleware) after the API and before the error handler. */
  mountClient?: (app: Express) => void;
  /** Development (vite middleware with hot reload): the CSP allows its inline scripts and websocket. */
  dev?: boolean;
  /** This instance's runner of sweep jobs (services/sweep-run.ts), woken when a sweep is queued through it. */
  sweeps?: { wake(): void };
  /** More probes for `/api/health` besides the database's (e.g. `bucket` for the object store). */
  healthChecks?: Record<string, HealthCheck>;
}

/** A JSON body in UTF-8 (no charset named, or utf-8): read as bytes on the import path. */
function isUtf8Json(req: IncomingMessage): boolean {
  const type = req.headers['content-type'];
  if (!type || type.split(';')[0].trim().toLowerCase() !== 'application/json') return false;
  const charset = /;\s*charset\s*=\s*"?([^";\s]+)/i.exec(type)?.[1]?.toLowerCase();
  return charset === undefined || charset === 'utf-8' || charset === 'utf8';
}

/** Largest accepted JSON body; a study's circuit and layout fit easily. */
export const JSON_LIMIT = '2mb';

export function createApp({ db, config, mailer, objects, sweeps, mountClient, dev = false, healthChecks = {} }: AppDeps): Express {
  const app = express();
  app.disable('x-powered-by');
  if (config.trustProxy) {
    // A number means "this many proxies in front"; anything else is Express's list/keyword syntax.
    app.set('trust proxy', /^\d+$/.test(config.trustProxy) ? Number(config.trustProxy) : config.trustProxy);
  }
  const lucia = createLucia(db, { cookieSecure: config.cookieSecure, idleHours: config.sessionIdleHours });
  const ctx: RouteContext = { db, config, mailer, objects, sweeps, lucia, limiter: createSignInLimiter(db, { addressLimit: config.signInAddressLimit, signUpLimit: config.signUpAddressLimit }) };

  app.use(securityHeaders({ dev }));
  app.use((_req, res, next) => {
    // Names the request in the log and in a 500's message, so a report can be matched to its log line.
    res.locals.requestId = randomUUID();
    res.setHeader('X-Request-Id', res.locals.requestId);
    next();
  });

  const api = express.Router();
  api.use((_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    next();
  });
  api.use(guardUrl);
  api.use(originCheck(config.appUrl));
  // A study file is kept as the bytes received and moved to the work pool, which decodes, parses
  // and checks it (services/transfer.ts): decoding, checking or parsing 2 MB here would stall every
  // other request. A body declared in another character set than UTF-8 is decoded here as text.
  api.use('/studies/import', express.raw({ type: isUtf8Json, limit: JSON_LIMIT }), express.text({ type: 'application/json', limit: JSON_LIMIT }));
  api.use(express.json({ limit: JSON_LIMIT }));
  api.use(guardBody);
  api.use(sessionMiddleware(db, lucia, { maxDays: config.sessionMaxDays, idleHours: config.sessionIdleHours }));
  api.use('/health', healthRoutes({ database: () => pingDb(db), bucket: bucketHealthCheck(objects), ...healthChecks }));
  api.use('/auth', authRoutes(ctx));
  api.use('/studies', reportRoutes(ctx));
  api.use('/studies', reviewRoutes(ctx));
  api.use('/studies', studyRoutes(ctx));
  api.use('/studies', balancingRoutes(ctx));
  api.use('/studies', sweepRoutes(ctx));
  api.use('/templates', templateRoutes(ctx));
  api.use('/notifications', notificationRoutes(ctx));
  api.use('/team', teamRoutes(ctx));
  api.use('/invites', inviteRoutes(ctx));
  api.use('/mail', mailRoutes(ctx));
  api.use('/audit', auditRoutes(ctx));
  api.use((req) => {
    throw new AppError(404, 'not-found', `No API route ${req.method} ${req.originalUrl.split('?')[0]}.`);
  });
  app.use('/api', api);

  mountClient?.(app);
  app.use(errorHandler);
  return app;
}
