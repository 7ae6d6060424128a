/** /api/mail: the team's outgoing mail, readable by owners (so invites can be followed without a mail server). */
import { Router } from 'express';
import type { MailListResponse } from '../../shared/api/mail.ts';
import { actorOf, requireRole } from '../auth/index.ts';
import { notFound } from '../errors.ts';
import { param, type RouteContext } from './context.ts';

export function mailRoutes({ mailer }: RouteContext): Router {
  const r = Router();
  r.use(requireRole('owner'));

  r.get('/', async (_req, res) => {
    const body: MailListResponse = { items: await mailer.list(actorOf(res).teamId) };
    res.json(body);
  });

  r.get('/:id', async (req, res) => {
    const message = await mailer.get(actorOf(res).teamId, param(req.params.id));
    if (!message) throw notFound('Message');
    res.json(message);
  });

  return r;
}
