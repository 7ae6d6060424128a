/** /api/audit: the team's audit trail (owner). */
import { Router } from 'express';
import { auditQuerySchema } from '../../shared/api/audit.ts';
import { actorOf, requireRole } from '../auth/index.ts';
import { listAudit } from '../services/audit.ts';
import type { RouteContext } from './context.ts';

export function auditRoutes({ db }: RouteContext): Router {
  const r = Router();
  r.get('/', requireRole('owner'), async (req, res) => {
    res.json(await listAudit(db, actorOf(res), auditQuerySchema.parse(req.query)));
  });
  return r;
}
