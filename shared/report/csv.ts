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

/** CSV text of a header and rows, caution first (and an optional second comment line). */
export function csvText(header: readonly string[], rows: readonly (readonly string[])[], extraComment?: string): string {
  const lines = [`# Caution: ${SAFETY_CAUTION}`, ...(extraComment ? [`# ${extraComment}`] : []), header.map(field).join(','), ...rows.map((r) => r.map(field).join(','))];
  return `${lines.join('\r\n')}\r\n`;
}

/** The CSV text of a table, caution first. */
export function toCsv(table: ResultTable, extraComment?: string): string {
  return csvText(table.columns, table.rows, extraComment);
}
