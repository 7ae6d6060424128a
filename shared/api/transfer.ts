/** Export and import of a study as a file (`GET /api/studies/:id/export`, `POST /api/studies/import`). */
import { z } from 'zod';
import { storableJson } from './limits.ts';
import { circuitEnvelopeSchema, studyDescriptionSchema, studyNameSchema } from './studies.ts';

/** A study file: the circuit (a `wyeward-circuit` object, valid for the engine) with its layout and settings. */
export const studyFileSchema = z.object({
  format: z.literal('wyeward-study', { message: 'format must be "wyeward-study" (or send a bare "wyeward-circuit" file)' }),
  version: z.literal(1, { message: 'Only version 1 study files are understood' }),
  name: studyNameSchema,
  description: studyDescriptionSchema.optional(),
  exportedAt: z.string().optional(),
  revision: z.number().int().nullable().optional(),
  circuit: circuitEnvelopeSchema,
  layout: storableJson.optional(),
  settings: storableJson.optional(),
});
export type StudyFile = z.infer<typeof studyFileSchema>;

/** POST /api/studies/import query. */
export const importQuerySchema = z.object({ name: studyNameSchema.optional() });
