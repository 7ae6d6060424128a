/**
 * Study cases in a circuit file: named lists of changes to the base circuit (`cases`, optional).
 * Only the structure is checked here; whether a change names a real element and whether the
 * changed element is valid is checked when the case is applied (cases/apply-case.ts), so that
 * the message names the case and the element.
 */
import { z } from 'zod';
import { idSchema } from './common.ts';

/** Replace the named top-level fields of one element. */
export const caseSetChangeSchema = z
  .strictObject({
    element: idSchema.meta({ description: 'Id of the element to change.' }),
    set: z.record(z.string(), z.unknown()).meta({ description: 'Top-level fields of the element replaced by these values (not merged), e.g. { "open": ["n"] } or { "each": { "kw": 3 } }. "id" and "type" cannot be changed.' }),
  })
  .meta({ description: 'Set fields of an element.' });

/** Add an element (same form as in `elements`). */
export const caseAddChangeSchema = z
  .strictObject({
    add: z.looseObject({ type: z.string(), id: idSchema }).meta({ description: 'An element, written as in "elements" (its id must be new).' }),
  })
  .meta({ description: 'Add an element.' });

/** Remove an element. */
export const caseRemoveChangeSchema = z
  .strictObject({ remove: idSchema.meta({ description: 'Id of the element to remove.' }) })
  .meta({ description: 'Remove an element.' });

export const caseChangeSchema = z.union([caseSetChangeSchema, caseAddChangeSchema, caseRemoveChangeSchema]);
export type CaseChange = z.infer<typeof caseChangeSchema>;

/** Reserved: the base circuit's own name among the cases (CLI `--all-cases`, compare views). */
export const BASE_CASE_ID = 'base';

/** One named case: the base circuit with `changes` applied in order. */
export const studyCaseSchema = z.strictObject({
  id: idSchema.refine((id) => id !== BASE_CASE_ID, `"${BASE_CASE_ID}" is reserved for the base circuit`).meta({ description: 'Unique among the cases; "base" is reserved.' }),
  name: z.string().optional().meta({ description: 'What the case is, in words ("Neutral lost at the drop").' }),
  changes: z.array(caseChangeSchema),
});
export type StudyCase = z.infer<typeof studyCaseSchema>;

/** The `cases` array (ids unique). */
export const casesSchema = z.array(studyCaseSchema).superRefine((cases, ctx) => {
  const seen = new Set<string>();
  cases.forEach((c, i) => {
    if (seen.has(c.id)) ctx.addIssue({ code: 'custom', path: [i, 'id'], message: `duplicate case id "${c.id}"` });
    seen.add(c.id);
  });
});
