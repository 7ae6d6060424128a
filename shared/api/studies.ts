/** Studies (`/api/studies/*`): team-scoped circuit studies with optimistic versioning. */
import { z } from 'zod';
import type { CircuitElementInput } from '../engine/index.ts';
import { isoDateSchema, revisionRiskSchema, userRefSchema } from './common.ts';
import { positiveInt32, storableJson } from './limits.ts';

export const STUDY_STATUSES = ['draft', 'in-review', 'changes-requested', 'approved'] as const;
export const studyStatusSchema = z.enum(STUDY_STATUSES);
export type StudyStatus = z.infer<typeof studyStatusSchema>;

/**
 * The envelope every stored circuit must have, typed as the engine's circuit (elements are the
 * engine's element inputs). The server validates the whole circuit with the engine's
 * `parseCircuit` on every write (so elements are only shape-checked as objects here, and a circuit
 * stored under older rules still reads back); this shape check is what the API guarantees on its own.
 */
export const circuitEnvelopeSchema = z.looseObject({
  format: z.literal('wyeward-circuit'),
  version: z.literal(1),
  frequencyHz: z.number().positive().max(1000),
  elements: z.array(z.custom<CircuitElementInput>((v) => v !== null && typeof v === 'object' && !Array.isArray(v), { error: 'each element must be an object' })),
});
export type CircuitEnvelope = z.infer<typeof circuitEnvelopeSchema>;

/** What a study holds: the circuit and, optionally, the diagram layout and the workspace settings (both kept verbatim). */
export const studyContentSchema = z.object({
  circuit: circuitEnvelopeSchema,
  layout: storableJson.optional(),
  settings: storableJson.optional(),
});
export type StudyContent = z.infer<typeof studyContentSchema>;

/** The content a study gets when created without one: an empty circuit at 60 Hz. */
export function emptyStudyContent(): StudyContent {
  return { circuit: { format: 'wyeward-circuit', version: 1, frequencyHz: 60, elements: [] } };
}

export const studyNameSchema = z.string().trim().min(1, 'Name is required').max(200, 'Name is at most 200 characters');
export const studyDescriptionSchema = z.string().trim().max(5000, 'Description is at most 5000 characters');

/** One row of the studies list. */
/**
 * `version` is the edit version used for optimistic concurrency (sent back on every save); it is
 * internal. Users read the revision number (`revision`) alone.
 */
export const studySummarySchema = z.object({
  id: z.string(),
  name: z.string(),
  description: z.string(),
  status: studyStatusSchema,
  isTemplate: z.boolean(),
  version: z.number().int(),
  createdBy: userRefSchema,
  updatedBy: userRefSchema,
  createdAt: isoDateSchema,
  updatedAt: isoDateSchema,
  /** Number of elements drawn in the study's circuit. */
  elementCount: z.number().int(),
  /** Number of the latest revision (what users count); null for a study never saved since revisions exist. */
  revision: z.number().int().nullable().optional(),
  /** Templates only: the danger of the revision a copy starts from (violations, the worst one). */
  risk: revisionRiskSchema.nullable().optional(),
});
export type StudySummary = z.infer<typeof studySummarySchema>;

/** A whole study (GET /api/studies/:id, PATCH answer). */
export const studyDetailSchema = studySummarySchema.extend({
  content: studyContentSchema,
  clonedFrom: z.object({ id: z.string(), name: z.string() }).nullable(),
  /** Revision of the source this study was started from (issue 5). */
  clonedFromRevision: z.number().int().nullable().optional(),
  /** The open (or last) review request. */
  review: z
    .object({ requestedBy: userRefSchema, reviewers: z.array(userRefSchema), revision: z.number().int() })
    .nullable()
    .optional(),
  /** The revision the current approval is bound to (null unless approved). */
  approvedRevision: z.number().int().nullable().optional(),
});
export type StudyDetail = z.infer<typeof studyDetailSchema>;

/** GET /api/studies query string. */
export const listStudiesQuerySchema = z.object({
  q: z.string().trim().max(200).optional(),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(20),
  template: z.enum(['true', 'false']).optional(),
  sort: z.enum(['updatedAt', 'name']).default('updatedAt'),
  dir: z.enum(['asc', 'desc']).default('desc'),
});
export type ListStudiesQuery = z.infer<typeof listStudiesQuerySchema>;

export const listStudiesResponseSchema = z.object({
  items: z.array(studySummarySchema),
  total: z.number().int(),
  page: z.number().int(),
  pageSize: z.number().int(),
});
export type ListStudiesResponse = z.infer<typeof listStudiesResponseSchema>;

/** POST /api/studies. */
export const createStudyRequestSchema = z.object({
  name: studyNameSchema,
  description: studyDescriptionSchema.optional(),
  content: studyContentSchema.optional(),
});
export type CreateStudyRequest = z.infer<typeof createStudyRequestSchema>;

/** Answer to create and clone: 201 `{ id, version }`. */
export const createdStudySchema = z.object({ id: z.string(), version: z.number().int() });
export type CreatedStudy = z.infer<typeof createdStudySchema>;

/** PATCH /api/studies/:id: `version` is the version the client edited. */
export const updateStudyRequestSchema = z.object({
  version: positiveInt32('version'),
  name: studyNameSchema.optional(),
  description: studyDescriptionSchema.optional(),
  content: studyContentSchema.optional(),
  isTemplate: z.boolean().optional(),
  /** Message of the revision a content change makes. */
  message: z.string().trim().max(500, 'Message is at most 500 characters').optional(),
});
export type UpdateStudyRequest = z.infer<typeof updateStudyRequestSchema>;

/** POST /api/studies/:id/clone. */
export const cloneStudyRequestSchema = z.object({ name: studyNameSchema.optional() });
export type CloneStudyRequest = z.infer<typeof cloneStudyRequestSchema>;

/** 409 body of a stale PATCH: the error plus the study as it is now. */
export const versionConflictBodySchema = z.object({
  error: z.object({ code: z.literal('version-conflict'), message: z.string() }),
  current: studyDetailSchema,
});
export type VersionConflictBody = z.infer<typeof versionConflictBodySchema>;

/** GET /api/templates: the team's templates, each with the danger of the revision a new study copies. */
export const templateListResponseSchema = z.object({
  items: z.array(studySummarySchema.extend({ risk: revisionRiskSchema.nullable() })),
});
export type TemplateListResponse = z.infer<typeof templateListResponseSchema>;
export type TemplateSummary = TemplateListResponse['items'][number];
