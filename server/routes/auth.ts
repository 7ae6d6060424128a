/** /api/auth: sign-up, sign-in, sign-out, me, demo accounts. */
import { Router, type Request, type Response } from 'express';
import { signInRequestSchema, signUpConfirmRequestSchema, signUpRequestSchema, type DemoInfo } from '../../shared/api/auth.ts';
import { actorOf } from '../auth/index.ts';
import { DEMO_ACCOUNTS } from '../db/demo-accounts.ts';
import { confirmSignUp, requestSignUp, signUpWithInvite, toMe, verifyCredentials } from '../services/auth.ts';
import type { RouteContext } from './context.ts';

export function authRoutes({ db, config, lucia, limiter, mailer }: RouteContext): Router {
  const r = Router();

  async function startSession(res: Response, userId: string) {
    const session = await lucia.createSession(userId, { createdAt: new Date() });
    res.appendHeader('Set-Cookie', lucia.createSessionCookie(session.id).serialize());
  }

  const addressOf = (req: Request) => req.ip ?? req.socket.remoteAddress ?? 'unknown';

  r.post('/sign-up', async (req, res) => {
    const input = signUpRequestSchema.parse(req.body);
    await limiter.signUp(addressOf(req));
    if (input.inviteToken) {
      const actor = await signUpWithInvite(db, { ...input, inviteToken: input.inviteToken });
      await startSession(res, actor.userId);
      res.status(201).json(toMe(actor));
      return;
    }
    res.status(202).json(await requestSignUp(db, mailer, config.appUrl, input));
  });

  r.post('/sign-up/confirm', async (req, res) => {
    const { token } = signUpConfirmRequestSchema.parse(req.body);
    await limiter.signUp(addressOf(req));
    const actor = await confirmSignUp(db, token);
    await startSession(res, actor.userId);
    res.status(201).json(toMe(actor));
  });

  r.post('/sign-in', async (req, res) => {
    const input = signInRequestSchema.parse(req.body);
    const actor = await verifyCredentials(db, limiter, input, addressOf(req));
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
