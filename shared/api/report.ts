/**
 * The study report and the CSV exports of a revision's results:
 * `GET /api/studies/:id/report.pdf?revision=<n>[&case=<id>][&units=si|pu]` (application/pdf) and
 * `GET /api/studies/:id/results.csv?table=buses|loads|elements|flags[&revision=][&case=][&units=]` (text/csv).
 * Without `revision`, the latest; without `case`, the base circuit; without `units`, volts and amperes.
 */
import { z } from 'zod';
import { CSV_TABLES } from '../report/tables.ts';
import { RESULT_UNITS } from '../report/per-unit.ts';

export const reportQuerySchema = z.object({
  revision: z
    .string()
    .regex(/^\d{1,9}$/, 'revision must be a whole number (a revision number of the study)')
    .transform(Number)
    .pipe(z.number().min(1, 'revision must be at least 1'))
    .optional(),
  case: z.string().trim().min(1, 'case must not be empty').max(200, 'case is at most 200 characters').optional(),
  units: z.enum(RESULT_UNITS, { error: 'units must be "si" or "pu"' }).default('si'),
});
export type ReportQuery = z.infer<typeof reportQuerySchema>;

export const resultsCsvQuerySchema = reportQuerySchema.extend({
  table: z.enum(CSV_TABLES, { error: `table must be one of ${CSV_TABLES.join(', ')}` }),
});
export type ResultsCsvQuery = z.infer<typeof resultsCsvQuerySchema>;

/** The report URL of a study (what the download link opens). */
export function reportUrl(studyId: string, q: { revision?: number; case?: string; units?: 'si' | 'pu' } = {}): string {
  const p = new URLSearchParams();
  if (q.revision) p.set('revision', String(q.revision));
  if (q.case) p.set('case', q.case);
  if (q.units && q.units !== 'si') p.set('units', q.units);
  const s = p.toString();
  return `/api/studies/${encodeURIComponent(studyId)}/report.pdf${s ? `?${s}` : ''}`;
}

/** The CSV URL of one results table. */
export function resultsCsvUrl(studyId: string, table: (typeof CSV_TABLES)[number], q: { revision?: number; case?: string; units?: 'si' | 'pu' } = {}): string {
  const p = new URLSearchParams({ table });
  if (q.revision) p.set('revision', String(q.revision));
  if (q.case) p.set('case', q.case);
  if (q.units && q.units !== 'si') p.set('units', q.units);
  return `/api/studies/${encodeURIComponent(studyId)}/results.csv?${p.toString()}`;
}
