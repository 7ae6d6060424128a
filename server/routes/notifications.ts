/** /api/notifications (own) and /api/templates (the team's template gallery). */
import { Router } from 'express';
import { markReadRequestSchema } from '../../shared/api/notifications.ts';
import { actorOf, requireUser } from '../auth/index.ts';
import { listNotifications, markRead } from '../services/notifications.ts';
import { listTemplates } from '../services/studies.ts';
import type { RouteContext } from './context.ts';

export function notificationRoutes({ db }: RouteContext): Router {
  const r = Router();
  r.get('/', requireUser, async (_req, res) => {
    res.json(await listNotifications(db, actorOf(res)));
  });
  r.post('/read', requireUser, async (req, res) => {
    res.json(await markRead(db, actorOf(res), markReadRequestSchema.parse(req.body ?? {})));
  });
  return r;
}

export function templateRoutes({ db }: RouteContext): Router {
  const r = Router();
  r.get('/', requireUser, async (_req, res) => {
    res.json(await listTemplates(db, actorOf(res)));
  });
  return r;
}
