/** /api/team (members, roles, invites) and the public /api/invites/:token. */
import { Router } from 'express';
import { createInviteRequestSchema, updateMemberRequestSchema } from '../../shared/api/team.ts';
import { actorOf, requireRole, requireUser } from '../auth/index.ts';
import { createInvite, getTeam, inviteInfo, removeMember, revokeInvite, updateMemberRole } from '../services/team.ts';
import { param, type RouteContext } from './context.ts';

export function teamRoutes({ db, mailer, config }: RouteContext): Router {
  const r = Router();
  const owner = requireRole('owner');

  r.get('/', requireUser, async (_req, res) => {
    res.json(await getTeam(db, actorOf(res)));
  });

  r.post('/invites', owner, async (req, res) => {
    res.status(201).json(await createInvite(db, mailer, config.appUrl, actorOf(res), createInviteRequestSchema.parse(req.body)));
  });

  r.delete('/invites/:id', owner, async (req, res) => {
    await revokeInvite(db, actorOf(res), param(req.params.id));
    res.status(204).end();
  });

  r.patch('/members/:userId', owner, async (req, res) => {
    const { role } = updateMemberRequestSchema.parse(req.body);
    res.json(await updateMemberRole(db, actorOf(res), param(req.params.userId), role));
  });

  r.delete('/members/:userId', owner, async (req, res) => {
    await removeMember(db, actorOf(res), param(req.params.userId));
    res.status(204).end();
  });

  return r;
}

export function inviteRoutes({ db }: RouteContext): Router {
  const r = Router();
  r.get('/:token', async (req, res) => {
    res.json(await inviteInfo(db, param(req.params.token)));
  });
  return r;
}
