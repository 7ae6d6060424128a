/** GET /api/studies/:id/report.pdf: the study report of a revision (a download link, no fetcher). */
import { reportUrl as url } from '../../../../shared/api/report.ts';

/** The report of the latest revision (or `revision`), in volts or per unit. */
export function reportUrl(id: string, q: { revision?: number; units?: 'si' | 'pu' } = {}): string {
  return url(id, q);
}
