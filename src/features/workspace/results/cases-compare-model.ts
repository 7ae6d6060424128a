/**
 * The cases compare table as data: one row per quantity that matters in a lost-neutral or
 * contingency review (each phase's voltage and the neutral shift per bus, voltage unbalance by each
 * definition (IEC, NEMA, IEEE),
 * each load's terminal voltage in volts and per unit of its rating, each element's neutral and
 * earth current, the number of flags), one value per case, the delta
 * against the base (the first case), and the worst case of each row: the largest value, or for a
 * phase voltage the furthest from the bus's nominal. Pure; labels speak of what the user drew.
 */
import type { CircuitResult } from '../../../../shared/engine/index.ts';

/** One case's outcome: its results, or why it could not be solved. */
export interface CaseOutcome {
  id: string;
  label: string;
  result?: CircuitResult;
  error?: string;
}

export interface CompareRow {
  key: string;
  label: string;
  unit: 'V' | 'A' | '%' | 'pu' | '';
  values: (number | null)[];
  /** value − base value (null when either is missing); deltas[0] is always null. */
  deltas: (number | null)[];
  /** Column of the worst case, or null when fewer than two cases have a value or all agree. */
  worst: number | null;
  /** For voltages: the value the worst case is furthest from. */
  nominal?: number;
}

interface RowSpec {
  label: string;
  unit: CompareRow['unit'];
  /** Nominal for voltages: worst is furthest from it. */
  nominal?: number;
}

/** Quantities of one result: key → value, with the specs of the rows. */
function quantities(r: CircuitResult, specs: Map<string, RowSpec>): Map<string, number> {
  const out = new Map<string, number>();
  const put = (key: string, spec: RowSpec, v: number) => {
    if (!specs.has(key)) specs.set(key, spec);
    out.set(key, v);
  };
  for (const b of r.buses) {
    const ref = b.lnReference === 'neutral' ? 'n' : 'earth';
    for (const [c, v] of Object.entries(b.lineToNeutral)) put(`v:${b.bus}:${c}`, { label: `${b.bus} ${c}-${ref}`, unit: 'V', nominal: b.nominalVLN }, v.mag);
    if (b.neutralToEarth) put(`shift:${b.bus}`, { label: `${b.bus} neutral shift`, unit: 'V' }, b.neutralToEarth.mag);
    if (b.iecUnbalancePercent !== undefined) put(`unb:${b.bus}`, { label: `${b.bus} unbalance (IEC)`, unit: '%' }, b.iecUnbalancePercent);
    if (b.nemaUnbalancePercent !== undefined) put(`unb-nema:${b.bus}`, { label: `${b.bus} unbalance (NEMA)`, unit: '%' }, b.nemaUnbalancePercent);
    if (b.ieeeUnbalancePercent !== undefined) put(`unb-ieee:${b.bus}`, { label: `${b.bus} unbalance (IEEE)`, unit: '%' }, b.ieeeUnbalancePercent);
  }
  for (const l of r.loads) {
    for (const b of l.branches) {
      const where = l.branches.length > 1 ? ` (${b.fromConductor}–${b.toConductor})` : '';
      put(`load:${l.id}:${b.branch}`, { label: `${l.id} terminal voltage${where}`, unit: 'V', nominal: b.ratedVolts }, b.voltage.mag);
      if (b.pu !== undefined) put(`load-pu:${l.id}:${b.branch}`, { label: `${l.id} terminal voltage${where}, per unit`, unit: 'pu', nominal: 1 }, b.pu);
    }
  }
  for (const e of Object.values(r.elements)) {
    const port = e.ports?.find((p) => p.conductors.includes('n'));
    if (port) put(`in:${e.id}`, { label: `${e.id} neutral current${port.bus ? ` at ${port.bus}` : ''}`, unit: 'A' }, port.currents[port.conductors.indexOf('n')].mag);
    if (e.earthCurrent) put(`ie:${e.id}`, { label: `${e.id} earth current`, unit: 'A' }, e.earthCurrent.mag);
  }
  put('flags', { label: 'flags raised', unit: '' }, r.flags.length);
  return out;
}

/** A row marks a worst case only when the cases differ by more than this (V, A, % or flags; a hundredth of it in pu): no marks on rounding noise. */
export const WORST_THRESHOLD = 0.05;
const thresholdOf = (unit: CompareRow['unit']) => (unit === 'pu' ? WORST_THRESHOLD / 100 : WORST_THRESHOLD);

/** The rows of the compare table, in the order quantities first appear (base first). */
export function compareCases(outcomes: readonly CaseOutcome[]): CompareRow[] {
  const specs = new Map<string, RowSpec>();
  const perCase = outcomes.map((o) => (o.result ? quantities(o.result, specs) : null));
  const rows: CompareRow[] = [];
  for (const [key, spec] of specs) {
    const values = perCase.map((q) => (q && q.has(key) ? q.get(key)! : null));
    const base = values[0];
    const deltas = values.map((v, i) => (i === 0 || v === null || base === null ? null : v - base));
    const badness = values.map((v) => (v === null ? null : spec.nominal ? Math.abs(v - spec.nominal) : v));
    let worst: number | null = null;
    const present = badness.filter((x): x is number => x !== null);
    if (present.length >= 2 && Math.max(...present) - Math.min(...present) > thresholdOf(spec.unit)) {
      worst = badness.indexOf(Math.max(...present));
    }
    rows.push({ key, label: spec.label, unit: spec.unit, values, deltas, worst, ...(spec.nominal !== undefined ? { nominal: spec.nominal } : {}) });
  }
  return rows;
}
