/**
 * A customer CSV read in the browser with papaparse (header row, any column order), checked at
 * once with the engine's own customer schema so row and column problems show before anything is
 * sent; the server reads and checks the text again.
 */
import Papa from 'papaparse';
import { CustomerListError, customersFromRecords, issueText, type Customer } from '../../../../shared/engine/index.ts';

export type ReadCustomers = { ok: true; text: string; customers: Customer[] } | { ok: false; problems: string[] };

export function readCustomersCsv(text: string): ReadCustomers {
  const parsed = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: 'greedy', transformHeader: (h) => h.trim() });
  const problems = parsed.errors.slice(0, 10).map((e) => (e.row !== undefined ? `row ${e.row + 2}: ${e.message}` : e.message));
  if (problems.length) return { ok: false, problems };
  try {
    return { ok: true, text, customers: customersFromRecords(parsed.data, parsed.meta.fields ?? []) };
  } catch (e) {
    if (e instanceof CustomerListError) return { ok: false, problems: e.issues.slice(0, 10).map(issueText) };
    throw e;
  }
}
