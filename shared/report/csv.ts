/**
 * A results table as CSV (RFC 4180: comma-separated, fields with a comma, quote or line break
 * quoted, CRLF line ends). The first line is the safety caution as a comment line starting with
 * "#" (read first, before any number; spreadsheet programs show it as one cell), then the header
 * row with the unit of every column, then the rows.
 */
import { SAFETY_CAUTION } from '../review/risk.ts';
import type { ResultTable } from './tables.ts';

function field(s: string): string {
  // A leading = + - @ would be run as a formula by spreadsheet programs: keep numbers, quote the rest (P).
  const guarded = /^[=+@]/.test(s) || (/^-/.test(s) && !/^-?\d/.test(s)) ? `'${s}` : s;
  return /[",\r\n]/.test(guarded) ? `"${guarded.replace(/"/g, '""')}"` : guarded;
}

/** The CSV text of a table, caution first. */
export function toCsv(table: ResultTable, extraComment?: string): string {
  const lines = [`# Caution: ${SAFETY_CAUTION}`, ...(extraComment ? [`# ${extraComment}`] : []), table.columns.map(field).join(','), ...table.rows.map((r) => r.map(field).join(','))];
  return `${lines.join('\r\n')}\r\n`;
}
