/**
 * Server sweep jobs (`/api/studies/:id/sweeps`): sweeps too large for a browser run on the server's
 * work threads, on the study's latest revision (or one of its cases), with progress and cancel.
 * Parameters are written as the CLI writes them (`<element>.<field>…` of an element as drawn).
 */
import { z } from 'zod';

/** Most points one server sweep may have. */
export const MAX_SERVER_SWEEP_POINTS = 200_000;
/** Most outputs one server sweep records. */
export const MAX_SWEEP_OUTPUTS = 24;

export const sweepParameterSchema = z.strictObject({
  path: z.string().trim().min(3, 'Name the value as <element>.<field>, e.g. KITCHEN.each.kw').max(300),
  from: z.number().finite(),
  to: z.number().finite(),
  points: z.number().int('The number of points must be a whole number').min(1, 'At least one point').max(MAX_SERVER_SWEEP_POINTS),
  scale: z.enum(['linear', 'log']).default('linear'),
});

/** POST /api/studies/:id/sweeps */
export const createSweepRequestSchema = z.strictObject({
  parameters: z.array(sweepParameterSchema).min(1, 'Sweep one or two parameters').max(2, 'Sweep one or two parameters'),
  /** Id of a study case to sweep on (default: the base circuit). */
  case: z.string().trim().min(1).max(200).optional(),
  /** Output keys (`load:<load>:<branch>`, `bus:<bus>:<phase>`, `shift:<bus>`, `unbalance:<bus>`); default: every load's terminal voltage, then bus figures, up to the limit. */
  outputs: z.array(z.string().max(300)).min(1).max(MAX_SWEEP_OUTPUTS).optional(),
});
export type CreateSweepRequest = z.infer<typeof createSweepRequestSchema>;

/** GET /api/studies/:id/sweeps/:job?offset=&limit= (points from `offset`, at most `limit`). */
export const sweepPointsQuerySchema = z.object({
  offset: z.coerce.number().int().min(0).default(0),
  limit: z.coerce.number().int().min(0).max(10_000).default(1_000),
});

export const sweepJobSchema = z.object({
  id: z.string(),
  status: z.enum(['running', 'done', 'failed', 'cancelled']),
  /** The study revision the sweep runs on. */
  revision: z.number().int().nullable(),
  caseName: z.string().nullable(),
  parameters: z.array(z.string()),
  outputs: z.array(z.object({ key: z.string(), label: z.string(), unit: z.string() })),
  total: z.number().int(),
  done: z.number().int(),
  /** Why the job stopped, in words (status "failed"). */
  error: z.string().nullable(),
  startedAt: z.string(),
  finishedAt: z.string().nullable(),
  offset: z.number().int(),
  /** Points from `offset` that are solved: the parameter values, the outputs in order, or why the point does not solve. */
  points: z.array(z.object({ values: z.array(z.number()), outputs: z.array(z.number().nullable()), error: z.string().optional() })),
  caution: z.string(),
});
export type SweepJob = z.infer<typeof sweepJobSchema>;
