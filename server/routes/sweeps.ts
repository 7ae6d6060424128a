/** /api/studies/:id/sweeps: start a server sweep job, read its progress and points, cancel it. */
import { Router } from 'express';
import { createSweepRequestSchema, sweepPointsQuerySchema } from '../../shared/api/sweeps.ts';
import { actorOf, requireRole, requireUser } from '../auth/index.ts';
import { cancelSweep, getSweep, startSweep } from '../services/sweeps.ts';
import { param, type RouteContext } from './context.ts';

export function sweepRoutes({ db, sweeps }: RouteContext): Router {
  const r = Router({ mergeParams: true });
  // Sweeps change nothing in the study, but they take the server's work threads: engineers and owners start and cancel them.
  const run = requireRole('engineer');

  r.post('/:id/sweeps', run, async (req, res) => {
    const job = await startSweep(db, actorOf(res), param(req.params.id), createSweepRequestSchema.parse(req.body));
    sweeps?.wake();
    res.status(202).json(job);
  });

  r.get('/:id/sweeps/:job', requireUser, async (req, res) => {
    res.json(await getSweep(db, actorOf(res), param(req.params.id), param(req.params.job), sweepPointsQuerySchema.parse(req.query)));
  });

  r.delete('/:id/sweeps/:job', run, async (req, res) => {
    res.json(await cancelSweep(db, actorOf(res), param(req.params.id), param(req.params.job)));
  });

  return r;
}
