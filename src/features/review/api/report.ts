/**
 * GET /api/studies/:id/report.pdf and GET /api/studies/:id/results.csv: the study report and the
 * CSV of a results table of a revision (download links, no fetcher).
 */
import { reportUrl as pdfUrl, resultsCsvUrl as csvUrl } from '../../../../shared/api/report.ts';
import type { CsvTable } from '../../../../shared/report/tables.ts';

/** The report of the latest revision (or `revision`), of its base circuit (or study case `case`), in volts or per unit. */
export function reportUrl(id: string, q: { revision?: number; case?: string; units?: 'si' | 'pu' } = {}): string {
  return pdfUrl(id, q);
}

/** One results table of the latest revision (or `revision`) as CSV. */
export function resultsCsvUrl(id: string, table: CsvTable, q: { revision?: number; units?: 'si' | 'pu' } = {}): string {
  return csvUrl(id, table, q);
}
