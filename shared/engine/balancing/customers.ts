/**
 * The customer list of a balancing study: one single-phase customer per row, connected between one
 * phase and the neutral of a bus of the feeder. CSV columns (header names, any order, any case):
 * `customer`, `bus`, `phase` (A, B or C), `kw`, and `kvar` or `pf` (lagging power factor, 0 < pf ≤ 1);
 * optional `fixed` (yes/no: a customer that must not move), `model` (z, i or p: constant impedance,
 * current or power at rated voltage; default p) and `phases` (the phases the customer may be moved
 * to, e.g. "AB"; default every phase its bus has). Errors name the row (as a spreadsheet numbers
 * it, the header being row 1) and the column, in words.
 */
import { z } from 'zod';
import { parseCsv } from './csv.ts';

export const BALANCE_PHASES = ['A', 'B', 'C'] as const;
export type BalancePhase = (typeof BALANCE_PHASES)[number];

/** One customer as the optimiser uses it. */
export interface Customer {
  customer: string;
  bus: string;
  phase: BalancePhase;
  kw: number;
  kvar: number;
  fixed: boolean;
  model: 'z' | 'i' | 'p';
  /** Phases the customer may be connected to (before the feeder's own phases are checked). */
  allowed: BalancePhase[];
  /** Row of the list it came from (header = row 1), for messages. */
  row?: number;
}

/** A problem in the customer list, in words: row number as a spreadsheet shows it, and the column. */
export interface CustomerIssue {
  row?: number;
  column?: string;
  message: string;
}

/** Thrown when a customer list cannot be used; `issues` lists every problem found. */
export class CustomerListError extends Error {
  readonly issues: CustomerIssue[];
  constructor(issues: CustomerIssue[]) {
    super(issues.map(issueText).slice(0, 5).join('; ') + (issues.length > 5 ? `; and ${issues.length - 5} more` : ''));
    this.name = 'CustomerListError';
    this.issues = issues;
  }
}

/** "row 4, column kw: …" */
export function issueText(i: CustomerIssue): string {
  const where = [i.row !== undefined ? `row ${i.row}` : '', i.column ? `column ${i.column}` : ''].filter(Boolean).join(', ');
  return where ? `${where}: ${i.message}` : i.message;
}

const number = (what: string) =>
  z
    .string()
    .trim()
    .min(1, `${what} is empty`)
    .transform((s, ctx) => {
      const x = Number(s);
      if (!Number.isFinite(x)) {
        // a spreadsheet set to a decimal comma writes 1,5: say how to write it
        const comma = /^[+-]?\d*,\d+$/.test(s) ? `; write decimals with a point, e.g. ${s.replace(',', '.')}` : '';
        ctx.addIssue({ code: 'custom', message: `${what} must be a number (found "${s}"${comma})` });
        return z.NEVER;
      }
      return x;
    });

const phaseText = z
  .string()
  .trim()
  .transform((s) => s.toUpperCase())
  .pipe(z.enum(BALANCE_PHASES, { error: 'the phase must be A, B or C' }));

/** Schema of one CSV row (all cells as text; absent optional columns are undefined). */
export const customerRowSchema = z
  .object({
    customer: z.string().trim().min(1, 'the customer name is empty'),
    bus: z.string().trim().min(1, 'the bus name is empty'),
    phase: phaseText,
    kw: number('kW').pipe(z.number().nonnegative('kW cannot be negative (generation is not balanced here)')),
    kvar: number('kvar').optional(),
    pf: number('the power factor').pipe(z.number().gt(0, 'the power factor must be above 0').lte(1, 'the power factor cannot exceed 1')).optional(),
    fixed: z
      .string()
      .trim()
      .transform((s) => s.toLowerCase())
      .pipe(z.enum(['', 'yes', 'no', 'y', 'n', 'true', 'false', '1', '0'], { error: 'fixed must be yes or no' }))
      .optional(),
    model: z
      .string()
      .trim()
      .transform((s) => s.toLowerCase())
      .pipe(z.enum(['', 'z', 'i', 'p'], { error: 'the model must be z (impedance), i (current) or p (power)' }))
      .optional(),
    phases: z
      .string()
      .trim()
      .transform((s) => s.toUpperCase().replace(/[\s,/]/g, ''))
      .pipe(z.string().regex(/^[ABC]*$/, 'phases lists the phases the customer may take, e.g. AB'))
      .optional(),
  })
  .superRefine((r, ctx) => {
    const hasKvar = r.kvar !== undefined;
    const hasPf = r.pf !== undefined;
    if (hasKvar === hasPf) ctx.addIssue({ code: 'custom', path: hasKvar ? ['pf'] : ['kvar'], message: hasKvar ? 'give kvar or pf, not both' : 'give kvar or pf' });
    if (r.phases && !r.phases.includes(r.phase)) ctx.addIssue({ code: 'custom', path: ['phases'], message: `the customer is on phase ${r.phase}, which its allowed phases (${r.phases}) do not include` });
  });

const COLUMNS = ['customer', 'bus', 'phase', 'kw', 'kvar', 'pf', 'fixed', 'model', 'phases'] as const;
const REQUIRED = ['customer', 'bus', 'phase', 'kw'] as const;
/** Most customers a list may hold. */
export const MAX_CUSTOMERS = 5000;

/** Customers from records (column → text), e.g. rows papaparse read with a header. Throws CustomerListError. */
export function customersFromRecords(records: Record<string, string | undefined>[], columnsPresent: string[]): Customer[] {
  const issues: CustomerIssue[] = [];
  const lower = columnsPresent.map((c) => c.trim().toLowerCase());
  for (const c of REQUIRED) if (!lower.includes(c)) issues.push({ column: c, message: `the column "${c}" is missing (columns: customer, bus, phase, kw, and kvar or pf)` });
  if (!lower.includes('kvar') && !lower.includes('pf')) issues.push({ column: 'kvar', message: 'give a "kvar" or a "pf" column' });
  const unknown = lower.filter((c) => c !== '' && !(COLUMNS as readonly string[]).includes(c));
  if (unknown.length) issues.push({ message: `unknown column${unknown.length > 1 ? 's' : ''} ${unknown.map((c) => `"${c}"`).join(', ')} (known: ${COLUMNS.join(', ')})` });
  if (issues.length) throw new CustomerListError(issues);
  if (records.length === 0) throw new CustomerListError([{ message: 'the list has no customers' }]);
  if (records.length > MAX_CUSTOMERS) throw new CustomerListError([{ message: `the list has ${records.length} customers; at most ${MAX_CUSTOMERS} are balanced at once` }]);
  const out: Customer[] = [];
  const seen = new Map<string, number>();
  records.forEach((rec, k) => {
    const row = k + 2;
    const cells: Record<string, string | undefined> = {};
    for (const [key, v] of Object.entries(rec)) cells[key.trim().toLowerCase()] = v;
    // a blank optional cell means "not given"
    for (const c of ['kvar', 'pf', 'fixed', 'model', 'phases']) if (cells[c] !== undefined && cells[c]!.trim() === '') delete cells[c];
    const name = (cells.customer ?? '').trim();
    const first = name ? seen.get(name) : undefined;
    if (name && first === undefined) seen.set(name, row);
    const parsed = customerRowSchema.safeParse(cells);
    if (first !== undefined) issues.push({ row, column: 'customer', message: `"${name}" is already the customer of row ${first}; each customer appears once` });
    if (!parsed.success) {
      for (const i of parsed.error.issues) {
        const column = typeof i.path[0] === 'string' ? i.path[0] : undefined;
        const message = i.code === 'invalid_type' ? `${column ?? 'a cell'} is missing` : i.message;
        issues.push({ row, column, message });
      }
      return;
    }
    if (first !== undefined) return;
    const r = parsed.data;
    const kvar = r.kvar ?? r.kw * Math.tan(Math.acos(r.pf!));
    out.push({
      customer: r.customer,
      bus: r.bus,
      phase: r.phase,
      kw: r.kw,
      kvar,
      fixed: ['yes', 'y', 'true', '1'].includes(r.fixed ?? ''),
      model: (r.model || 'p') as Customer['model'],
      allowed: r.phases ? BALANCE_PHASES.filter((p) => r.phases!.includes(p)) : [...BALANCE_PHASES],
      row,
    });
  });
  if (issues.length) throw new CustomerListError(issues);
  return out;
}

/** Customers from CSV text (header row first). Throws CustomerListError. */
export function parseCustomersCsv(text: string): Customer[] {
  let rows: string[][];
  try {
    rows = parseCsv(text);
  } catch (e) {
    throw new CustomerListError([{ message: (e as Error).message }]);
  }
  if (rows.length === 0) throw new CustomerListError([{ message: 'the file is empty (expected a header row: customer,bus,phase,kw,kvar)' }]);
  const header = rows[0].map((h) => h.trim());
  const issues: CustomerIssue[] = [];
  const records = rows.slice(1).map((cells, k) => {
    if (cells.length !== header.length) issues.push({ row: k + 2, message: `has ${cells.length} cells; the header has ${header.length}` });
    return Object.fromEntries(header.map((h, i) => [h, cells[i]]));
  });
  if (issues.length) throw new CustomerListError(issues);
  return customersFromRecords(records, header);
}
