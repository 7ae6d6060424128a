/**
 * The results of a solved circuit as plain tables of text (header cells carry their units), in the
 * names the user drew: the one model the PDF report, the CSV exports and the print view read, so
 * each says the same numbers in the same words. Generated names (with "~") and a block's internal
 * points ("#") never appear: private buses and hidden switches are left out, element ports name the
 * bus as drawn, flag messages go through `circuitNames().text`.
 * Pure TypeScript: shared by the server and the browser.
 */
import type { BusResult, CircuitResult, Flag, Phasor } from '../engine/index.ts';
import { circuitNames, conductorName, isPrivateName, typeWord, type CircuitNames } from '../review/user-names.ts';
import { formatAngle, formatMagnitude, formatPercent, formatPu } from './format.ts';
import { busBase, type BusBase, type PerUnitSettings, type ResultUnits } from './per-unit.ts';

/** One table: header cells with units, rows of text, an optional note. */
export interface ResultTable {
  id: string;
  title: string;
  columns: string[];
  rows: string[][];
  note?: string;
}

/** The tables a user can export as CSV. */
export const CSV_TABLES = ['buses', 'loads', 'elements', 'flags'] as const;
export type CsvTable = (typeof CSV_TABLES)[number];

const LN_ORDER = ['a', 'b', 'c', '1', '2'];
const LL_ORDER = ['ab', 'bc', 'ca', '12'];

/** "A–N", "1–N" (a bus without a neutral: to earth, said in the note). */
const lnLabel = (c: string) => `${conductorName(c).replace('leg ', '')}–N`;
/** "A–B", "1–2". */
const llLabel = (p: string) => `${conductorName(p[0]).replace('leg ', '')}–${conductorName(p[1]).replace('leg ', '')}`;

const mag = (p: Phasor | undefined) => (p ? formatMagnitude(p.mag) : '');
const ang = (p: Phasor | undefined) => (p ? (p.mag < 1e-6 ? formatAngle(0) : formatAngle(p.angleDeg)) : '');

/** A block's internal point in words ("LD#star" → "the star point of LD"). */
function internalWords(text: string): string {
  const points: Record<string, string> = { star: 'the star point', hvStar: 'the HV star point', lvStar: 'the LV star point', f: 'the fault point' };
  return text.replace(/[^\s,;:()#]+#([A-Za-z]+)/g, (t, p: string) => `${points[p] ?? 'an internal point'} of ${t.slice(0, t.lastIndexOf('#'))}`);
}

/** What every table builder needs. */
export interface TableContext {
  result: CircuitResult;
  names: CircuitNames;
  units: ResultUnits;
  perUnit: PerUnitSettings;
}

export function tableContext(circuit: unknown, result: CircuitResult, units: ResultUnits, perUnit: PerUnitSettings): TableContext {
  return { result, names: circuitNames(circuit), units, perUnit };
}

/** Buses the user drew (private terminal buses left out). */
export function drawnBuses(result: CircuitResult): BusResult[] {
  return result.buses.filter((b) => !isPrivateName(b.bus));
}

/** A magnitude in the chosen units: V (or A) as formatted, or per unit of `base` (blank without a base). */
function inUnits(ctx: TableContext, x: number | undefined, base: number | undefined): string {
  if (x === undefined) return '';
  if (ctx.units === 'si') return formatMagnitude(x);
  return base ? formatPu(x / base) : '';
}

/** The unit word of a voltage or current column. */
const unitOf = (ctx: TableContext, si: 'V' | 'A') => (ctx.units === 'pu' ? 'pu' : si);

/** Bus voltages: line to neutral and line to line (magnitude, angle), neutral shift, sequence, unbalance by each definition. */
export function busTable(ctx: TableContext): ResultTable {
  const buses = drawnBuses(ctx.result);
  const ln = LN_ORDER.filter((c) => buses.some((b) => b.lineToNeutral[c]));
  const ll = LL_ORDER.filter((p) => buses.some((b) => b.lineToLine[p]));
  const seq = buses.some((b) => b.sequence);
  const u = unitOf(ctx, 'V');
  const columns = [
    'Bus',
    'Nominal V_LN (V)',
    ...ln.flatMap((c) => [`${lnLabel(c)} (${u})`, `${lnLabel(c)} angle (°)`]),
    ...ll.flatMap((p) => [`${llLabel(p)} (${u})`, `${llLabel(p)} angle (°)`]),
    `Neutral shift (${u})`,
    'Neutral shift (% of nominal V_LN)',
    ...(seq ? [`V0 (${u})`, `V1 (${u})`, `V2 (${u})`] : []),
    'IEC V2/V1 (%)',
    'NEMA line-voltage unbalance (%)',
    'IEEE phase-voltage unbalance (%)',
  ];
  const rows = buses.map((b) => {
    const base = busBase(ctx.perUnit, b);
    return [
      b.bus,
      b.nominalVLN !== undefined ? formatMagnitude(b.nominalVLN) : '',
      ...ln.flatMap((c) => [inUnits(ctx, b.lineToNeutral[c]?.mag, base?.vLN), ang(b.lineToNeutral[c])]),
      ...ll.flatMap((p) => [inUnits(ctx, b.lineToLine[p]?.mag, base?.vLL), ang(b.lineToLine[p])]),
      inUnits(ctx, b.neutralToEarth?.mag, base?.vLN),
      b.neutralShiftPercent !== undefined ? formatPercent(b.neutralShiftPercent) : '',
      ...(seq ? [b.sequence?.zero, b.sequence?.positive, b.sequence?.negative].map((p) => inUnits(ctx, p?.mag, base?.vLN)) : []),
      b.iecUnbalancePercent !== undefined ? formatPercent(b.iecUnbalancePercent) : '',
      b.nemaUnbalancePercent !== undefined ? formatPercent(b.nemaUnbalancePercent) : '',
      b.ieeeUnbalancePercent !== undefined ? formatPercent(b.ieeeUnbalancePercent) : '',
    ];
  });
  return {
    id: 'buses',
    title: 'Bus voltages',
    columns,
    rows,
    note:
      'RMS. Line-to-neutral columns are to earth at a bus without a neutral. Neutral shift: neutral-to-earth voltage. Sequence components of the voltages to earth. ' +
      'Unbalance: IEC |V2|/|V1|; NEMA line-voltage max deviation from average; IEEE phase-voltage (line-to-neutral) max deviation.' +
      (ctx.units === 'pu' ? ` Per unit of the bus's base voltage (line to neutral or line to line) on ${ctx.perUnit.baseMva} MVA.` : ''),
  };
}

const STATUS_WORDS: Record<string, string> = {
  ok: 'within',
  'warning-high': 'high (warning)',
  'warning-low': 'low (warning)',
  'violation-high': 'high (violation)',
  'violation-low': 'low (violation)',
  unrated: 'no rating',
};

/** Per-load terminal voltages against each load's rating. */
export function loadTable(ctx: TableContext): ResultTable {
  const byBus = new Map(ctx.result.buses.map((b) => [b.bus, b] as const));
  const u = unitOf(ctx, 'V');
  const rows: string[][] = [];
  for (const l of ctx.result.loads) {
    if (ctx.names.isHidden(l.id) || isPrivateName(l.id)) continue;
    const bus = ctx.names.drawnBus(l.bus);
    const base = busBase(ctx.perUnit, byBus.get(bus) ?? {});
    for (const br of l.branches) {
      const between = [br.fromConductor, br.toConductor].map((c) => (c === 'star' ? 'star point' : conductorName(c).replace('leg ', ''))).join('–');
      const phaseToPhase = /^[abc12]$/.test(br.fromConductor) && /^[abc12]$/.test(br.toConductor);
      rows.push([
        l.id,
        bus,
        between,
        inUnits(ctx, br.voltage.mag, phaseToPhase ? base?.vLL : base?.vLN),
        ang(br.voltage),
        br.ratedVolts !== undefined ? formatMagnitude(br.ratedVolts) : '',
        br.pu !== undefined ? formatPu(br.pu) : '',
        STATUS_WORDS[br.status] ?? br.status,
      ]);
    }
  }
  return {
    id: 'loads',
    title: 'Load terminal voltages',
    columns: ['Load', 'Bus', 'Across', `Voltage (${u})`, 'Angle (°)', 'Rated (V)', 'Of its rating (pu)', 'Status'],
    rows,
    note: "The voltage across each load's own terminals, in per unit of its own rating (its kV or rated volts, else the bus nominal).",
  };
}

const CONDUCTOR_ORDER = ['a', 'b', 'c', 'n', '1', '2'];

/** Element currents: one row per connection of each element (both sides of banks), a column pair per conductor, and the earth current. */
export function elementTable(ctx: TableContext): ResultTable {
  const byBus = new Map(ctx.result.buses.map((b) => [b.bus, b] as const));
  const u = unitOf(ctx, 'A');
  const shown = Object.values(ctx.result.elements).filter((e) => !ctx.names.isHidden(e.id) && !isPrivateName(e.id));
  const present = CONDUCTOR_ORDER.filter((c) => shown.some((e) => (e.ports ?? []).some((p) => p.conductors.includes(c))));
  const hasEarth = shown.some((e) => e.earthCurrent);
  const rows: string[][] = [];
  for (const e of shown) {
    const ports = (e.ports ?? []).filter((p) => p.conductors.some((c) => present.includes(c)));
    ports.forEach((p, k) => {
      const bus = p.bus ? ctx.names.drawnBus(p.bus) : '';
      const base = busBase(ctx.perUnit, byBus.get(bus) ?? {});
      const earth = k === 0 && e.earthCurrent ? e.earthCurrent : undefined;
      rows.push([
        e.id,
        typeWord(e.type),
        bus,
        ...present.flatMap((c) => {
          const i = p.conductors.indexOf(c);
          return i < 0 ? ['', ''] : [inUnits(ctx, p.currents[i]?.mag, base?.amps), ang(p.currents[i])];
        }),
        ...(hasEarth ? [earth ? formatMagnitude(earth.mag) : ''] : []),
      ]);
    });
    if (ports.length === 0 && e.earthCurrent && hasEarth) rows.push([e.id, typeWord(e.type), '', ...present.flatMap(() => ['', '']), formatMagnitude(e.earthCurrent.mag)]);
  }
  const name = (c: string) => (c === 'n' ? 'N' : conductorName(c).replace('leg ', 'Leg '));
  return {
    id: 'elements',
    title: 'Element currents',
    columns: ['Element', 'Kind', 'Bus', ...present.flatMap((c) => [`${name(c)} (${u})`, `${name(c)} angle (°)`]), ...(hasEarth ? ['Earth (A)'] : [])],
    rows,
    note: 'RMS, into the element at each of its connections (a bank: one row per side). Earth: from the element into earth.' + (ctx.units === 'pu' ? ' Per unit of the base current of the bus level (earth currents in A).' : ''),
  };
}

/** Power and losses per element, with the totals and the power-balance check. */
export function powerTable(ctx: TableContext): ResultTable {
  const kw = (s?: Phasor) => (s ? (ctx.units === 'pu' ? formatPu(s.re / (ctx.perUnit.baseMva * 1e6)) : formatMagnitude(s.re / 1000)) : '');
  const kvar = (s?: Phasor) => (s ? (ctx.units === 'pu' ? formatPu(s.im / (ctx.perUnit.baseMva * 1e6)) : formatMagnitude(s.im / 1000)) : '');
  const rows: string[][] = [];
  for (const e of Object.values(ctx.result.elements)) {
    if (ctx.names.isHidden(e.id) || isPrivateName(e.id)) continue;
    rows.push([e.id, typeWord(e.type), kw(e.power), kvar(e.power), kw(e.losses), kvar(e.losses), e.loadingPercent !== undefined ? formatPercent(e.loadingPercent) : '']);
  }
  const t = ctx.result.totals;
  rows.push(['Total delivered by sources', '', kw(t.sourcePower), kvar(t.sourcePower), '', '', '']);
  rows.push(['Total absorbed by loads', '', kw(t.loadPower), kvar(t.loadPower), '', '', '']);
  rows.push(['Total losses', '', '', '', kw(t.losses), kvar(t.losses), '']);
  const [p, q] = ctx.units === 'pu' ? ['P (pu)', 'Q (pu)'] : ['P (kW)', 'Q (kvar)'];
  return {
    id: 'power',
    title: 'Power and losses',
    columns: ['Element', 'Kind', p, q, `Losses ${p}`, `Losses ${q}`, 'Loading (%)'],
    rows,
    note: `S = V·I*, load convention (Q > 0 lagging); sources: power delivered at their terminals.${ctx.units === 'pu' ? ` Per unit of ${ctx.perUnit.baseMva} MVA.` : ''}`,
  };
}

/** Fault currents per phase, to earth, and their sequence components (in pu: of the base current of the faulted bus's level). */
export function faultTable(ctx: TableContext): ResultTable {
  const byBus = new Map(ctx.result.buses.map((b) => [b.bus, b] as const));
  const u = unitOf(ctx, 'A');
  const rows = ctx.result.faults
    .filter((f) => !isPrivateName(f.id))
    .map((f) => {
      const bus = ctx.names.drawnBus(f.bus);
      const amps = busBase(ctx.perUnit, byBus.get(bus) ?? byBus.get(f.bus) ?? {})?.amps;
      const i = (x: number) => inUnits(ctx, x, amps);
      return [f.id, bus, f.phases.map(conductorName).join(', '), ...(['a', 'b', 'c'] as const).map((c) => i(f.phaseCurrents[c].mag)), i(f.earthCurrent.mag), i(f.sequence.zero.mag), i(f.sequence.positive.mag), i(f.sequence.negative.mag)];
    });
  return {
    id: 'faults',
    title: 'Fault currents',
    columns: ['Fault', 'Bus', 'Phases', `A (${u})`, `B (${u})`, `C (${u})`, `Earth (${u})`, `I0 (${u})`, `I1 (${u})`, `I2 (${u})`],
    rows,
    ...(ctx.units === 'pu' ? { note: "Per unit of the base current of the faulted bus's level." } : {}),
  };
}

const SEVERITY_WORDS: Record<Flag['severity'], string> = { violation: 'violation', warning: 'warning', info: 'note' };

/** The standard (or practice) a flag's limit comes from, in words. */
export function flagSource(f: Flag, result: CircuitResult): string {
  const set = result.limits.id === 'iec-en' ? 'IEC/EN (EN 50160)' : 'ANSI C84.1';
  switch (f.code) {
    case 'voltage-low':
    case 'voltage-high':
    case 'load-voltage-low':
    case 'load-voltage-high':
    case 'load-low-voltage':
      return `${set} voltage range`;
    case 'unbalance':
      return `${set} unbalance, ${f.metric === 'iec' ? 'IEC |V2|/|V1|' : f.metric === 'nema' ? 'NEMA line-voltage' : 'IEEE phase-voltage'} definition`;
    case 'neutral-shift':
    case 'overload':
      return 'Common practice (no standard figure)';
    default:
      return 'Model check';
  }
}

/** The words of a flag's message as the user drew the circuit. */
export function flagText(ctx: Pick<TableContext, 'names'>, f: Flag): string {
  return internalWords(ctx.names.text(f.message));
}

/** Every flag with its value, limit and the source of the limit. */
export function flagTable(ctx: TableContext): ResultTable {
  const rows = ctx.result.flags.map((f) => [
    SEVERITY_WORDS[f.severity],
    f.bus ? ctx.names.drawnBus(f.bus) : f.elementId ? ctx.names.drawnElement(f.elementId) : '',
    flagText(ctx, f),
    formatMagnitude(f.value),
    f.limit !== undefined ? formatMagnitude(f.limit) : '',
    f.unit,
    flagSource(f, ctx.result),
  ]);
  return { id: 'flags', title: 'Flags', columns: ['Severity', 'Where', 'What', 'Value', 'Limit', 'Unit', 'Limit from'], rows, note: `Limit set: ${ctx.result.limits.name}.` };
}

/** One CSV table by name. */
export function csvTable(ctx: TableContext, table: CsvTable): ResultTable {
  switch (table) {
    case 'buses':
      return busTable(ctx);
    case 'loads':
      return loadTable(ctx);
    case 'elements':
      return elementTable(ctx);
    case 'flags':
      return flagTable(ctx);
  }
}

/** The bases a per-unit table was made on, per voltage level, in words. */
export function basesWords(ctx: TableContext): string {
  const seen = new Map<string, BusBase>();
  for (const b of drawnBuses(ctx.result)) {
    const base = busBase(ctx.perUnit, b);
    if (base && !seen.has(base.level)) seen.set(base.level, base);
  }
  const levels = [...seen.values()].map((b) => `${b.level} kV level: ${formatMagnitude(b.vLL)} V line to line, ${formatMagnitude(b.vLN)} V line to neutral, ${formatMagnitude(b.amps)} A`);
  return `Bases: ${ctx.perUnit.baseMva} MVA${levels.length ? `; ${levels.join('; ')}` : ''}.`;
}
