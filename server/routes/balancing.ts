/** POST /api/studies/:id/balance: phase balancing of a study (any team member; it writes nothing). */
import { Router } from 'express';
import { balanceRequestSchema } from '../../shared/api/balancing.ts';
import { actorOf, requireUser } from '../auth/index.ts';
import { balanceStudy } from '../services/balancing.ts';
import { param, type RouteContext } from './context.ts';

export function balancingRoutes({ db }: RouteContext): Router {
  const r = Router();
  r.post('/:id/balance', requireUser, async (req, res) => {
    const input = balanceRequestSchema.parse(req.body);
    // a client that goes away (the Cancel button aborts its request) stops the job
    const cancel = new AbortController();
    res.on('close', () => {
      if (!res.writableFinished) cancel.abort();
    });
    res.json(await balanceStudy(db, actorOf(res), param(req.params.id), input, cancel.signal));
  });
  return r;
}
