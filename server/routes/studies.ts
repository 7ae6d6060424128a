/** /api/studies: list, create, read, update (versioned), soft delete, clone. */
import { Router } from 'express';
import {
  cloneStudyRequestSchema,
  createStudyRequestSchema,
  listStudiesQuerySchema,
  updateStudyRequestSchema,
} from '../../shared/api/studies.ts';
import { actorOf, requireRole, requireUser } from '../auth/index.ts';
import { cloneStudy, createStudy, deleteStudy, getStudy, listStudies, updateStudy } from '../services/studies.ts';
import { param, type RouteContext } from './context.ts';

export function studyRoutes({ db }: RouteContext): Router {
  const r = Router();
  const write = requireRole('engineer');

  r.get('/', requireUser, async (req, res) => {
    res.json(await listStudies(db, actorOf(res), listStudiesQuerySchema.parse(req.query)));
  });

  r.post('/', write, async (req, res) => {
    res.status(201).json(await createStudy(db, actorOf(res), createStudyRequestSchema.parse(req.body)));
  });

  r.get('/:id', requireUser, async (req, res) => {
    res.json(await getStudy(db, actorOf(res), param(req.params.id)));
  });

  r.patch('/:id', write, async (req, res) => {
    res.json(await updateStudy(db, actorOf(res), param(req.params.id), updateStudyRequestSchema.parse(req.body)));
  });

  r.delete('/:id', write, async (req, res) => {
    await deleteStudy(db, actorOf(res), param(req.params.id));
    res.status(204).end();
  });

  r.post('/:id/clone', write, async (req, res) => {
    res.status(201).json(await cloneStudy(db, actorOf(res), param(req.params.id), cloneStudyRequestSchema.parse(req.body ?? {})));
  });

  return r;
}
