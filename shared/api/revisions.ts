/** Revisions and diffs (`/api/studies/:id/revisions`, `/api/studies/:id/diff`): immutable snapshots of a study. */
import { z } from 'zod';
import type { ResultsSummary } from '../review/summary.ts';
import type { RevisionDiff } from '../review/diff.ts';
import { isoDateSchema, userRefSchema } from './common.ts';
import { positiveInt32, positiveInt32Query } from './limits.ts';
import { studyContentSchema, studyDetailSchema, type StudyContent } from './studies.ts';

export const revisionMessageSchema = z.string().trim().max(500, 'Message is at most 500 characters');

/** The solve outcome of a revision, in short. */
export const revisionResultsSchema = z.union([
  z.object({ ok: z.literal(true), flagCount: z.number().int(), violationCount: z.number().int() }),
  z.object({ ok: z.literal(false), error: z.object({ code: z.string(), message: z.string() }) }),
]);

/** One row of the history. */
export const revisionSummarySchema = z.object({
  number: z.number().int(),
  message: z.string(),
  author: userRefSchema,
  createdAt: isoDateSchema,
  engineVersion: z.string(),
  restoredFrom: z.number().int().nullable(),
  results: revisionResultsSchema,
});
export type RevisionSummary = z.infer<typeof revisionSummarySchema>;

/** A whole revision (GET /api/studies/:id/revisions/:n). `summary` is a ResultsSummary (shared/review/summary.ts). */
export type Revision = RevisionSummary & { content: StudyContent; summary: ResultsSummary };

export const revisionListResponseSchema = z.object({ items: z.array(revisionSummarySchema) });
export type RevisionListResponse = z.infer<typeof revisionListResponseSchema>;

/** POST /api/studies/:id/revisions. */
export const createRevisionRequestSchema = z.object({
  version: positiveInt32('version'),
  content: studyContentSchema,
  message: revisionMessageSchema.optional(),
});
export type CreateRevisionRequest = z.infer<typeof createRevisionRequestSchema>;

/** POST /api/studies/:id/revisions/:n/restore. */
export const restoreRevisionRequestSchema = z.object({
  version: positiveInt32('version'),
  message: revisionMessageSchema.optional(),
});
export type RestoreRevisionRequest = z.infer<typeof restoreRevisionRequestSchema>;

/** Answer of create and restore: 201. */
export const savedRevisionSchema = z.object({ revision: revisionSummarySchema, study: studyDetailSchema });
export type SavedRevision = z.infer<typeof savedRevisionSchema>;

/** GET /api/studies/:id/diff query: `to` defaults to the latest revision, `from` to `to − 1`. */
export const diffQuerySchema = z.object({
  from: positiveInt32Query('from').optional(),
  to: positiveInt32Query('to').optional(),
});
export type DiffQuery = z.infer<typeof diffQuerySchema>;

export type { RevisionDiff };
