/** /api/auth: sign-up, sign-in, sign-out, me, demo accounts. */
import { Router, type Response } from 'express';
import { signInRequestSchema, signUpRequestSchema, type DemoInfo } from '../../shared/api/auth.ts';
import { actorOf } from '../auth/index.ts';
import { DEMO_ACCOUNTS } from '../db/demo-accounts.ts';
import { signUp, toMe, verifyCredentials } from '../services/auth.ts';
import type { RouteContext } from './context.ts';

export function authRoutes({ db, config, lucia, limiter }: RouteContext): Router {
  const r = Router();

  async function startSession(res: Response, userId: string) {
    const session = await lucia.createSession(userId, {});
    res.appendHeader('Set-Cookie', lucia.createSessionCookie(session.id).serialize());
  }

  r.post('/sign-up', async (req, res) => {
    const actor = await signUp(db, signUpRequestSchema.parse(req.body));
    await startSession(res, actor.userId);
    res.status(201).json(toMe(actor));
  });

  r.post('/sign-in', async (req, res) => {
    const input = signInRequestSchema.parse(req.body);
    const actor = await verifyCredentials(db, limiter, input, req.ip ?? req.socket.remoteAddress ?? 'unknown');
    await startSession(res, actor.userId);
    res.json(toMe(actor));
  });

  r.post('/sign-out', async (_req, res) => {
    if (res.locals.session) await lucia.invalidateSession(res.locals.session.id);
    res.appendHeader('Set-Cookie', lucia.createBlankSessionCookie().serialize());
    res.status(204).end();
  });

  r.get('/me', (_req, res) => {
    res.json(toMe(actorOf(res)));
  });

  r.get('/demo', (_req, res) => {
    const body: DemoInfo = { demo: config.demo, accounts: config.demo ? DEMO_ACCOUNTS.map(({ email, role, password }) => ({ email, role, password })) : [] };
    res.json(body);
  });

  return r;
}
