/**
 * A customer CSV read in the browser with papaparse (header row, any column order), checked at
 * once with the engine's own customer schema so row and column problems show before anything is
 * sent; the server reads and checks the text again. Both sides agree on what the file says: the
 * separator is the engine's choice (comma, or the semicolon or tab of the header line), an empty
 * file gets the engine's words, and a file over the server's size limit is refused here.
 */
import Papa from 'papaparse';
import { MAX_CUSTOMERS_CSV_CHARS } from '../../../../shared/api/balancing.ts';
import { CustomerListError, csvDelimiter, customersFromRecords, issueText, parseCustomersCsv, type Customer } from '../../../../shared/engine/index.ts';

export type ReadCustomers = { ok: true; text: string; customers: Customer[] } | { ok: false; problems: string[] };

const listProblems = (e: unknown): string[] => {
  if (e instanceof CustomerListError) return e.issues.slice(0, 10).map(issueText);
  throw e;
};

export function readCustomersCsv(text: string): ReadCustomers {
  if (text.length > MAX_CUSTOMERS_CSV_CHARS) {
    const n = (x: number) => x.toLocaleString('en-GB').replace(/,/g, ' ');
    return { ok: false, problems: [`the file is too large (${n(text.length)} characters; at most ${n(MAX_CUSTOMERS_CSV_CHARS)}, about 5 000 customers)`] };
  }
  if (text.replace(/^\ufeff/, '').trim() === '') {
    try {
      parseCustomersCsv(text);
    } catch (e) {
      return { ok: false, problems: listProblems(e) };
    }
  }
  const parsed = Papa.parse<Record<string, string>>(text, { header: true, delimiter: csvDelimiter(text), skipEmptyLines: 'greedy', transformHeader: (h) => h.trim() });
  const problems = parsed.errors.slice(0, 10).map((e) => (e.row !== undefined ? `row ${e.row + 2}: ${e.message}` : e.message));
  if (problems.length) return { ok: false, problems };
  try {
    return { ok: true, text, customers: customersFromRecords(parsed.data, parsed.meta.fields ?? []) };
  } catch (e) {
    return { ok: false, problems: listProblems(e) };
  }
}
