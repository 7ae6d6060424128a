/**
 * What the report says besides the results tables, in the user's words: the scope and assumptions,
 * the input of each element grouped by kind, the study case being reported and the flagged buses
 * whose phasors are drawn. The PDF (server/report/pdf.ts) and the print view in the app read the
 * same text, so both documents say the same. Pure TypeScript (shared).
 */
import { applyCase, BASE_CASE_ID, circuitCases, EngineError, solveCircuit, type CircuitResult } from '../engine/index.ts';
import { complexText, parameterWords, valueWords } from '../review/parameter-words.ts';
import { circuitNames, drawnElements, typeWord, type CircuitNames } from '../review/user-names.ts';

/** The circuit reported (the base, or a case applied to it) and the case's name in words. */
export function reportedCircuit(base: unknown, caseId?: string): { circuit: Record<string, unknown>; caseName: string | null } {
  if (!caseId || caseId === BASE_CASE_ID) return { circuit: base as Record<string, unknown>, caseName: null };
  const c = circuitCases(base).find((x) => x.id === caseId);
  return { circuit: applyCase(base as Record<string, unknown>, caseId) as unknown as Record<string, unknown>, caseName: c?.name?.trim() || caseId };
}

/** The reported circuit solved: its result, or the engine's refusal in the user's words. */
export interface ReportedSolution {
  circuit: Record<string, unknown>;
  caseName: string | null;
  names: CircuitNames;
  result: CircuitResult | null;
  failure: string | null;
}

/** Solves the reported circuit (base or case) for the PDF and the print view alike. */
export function solveReported(base: unknown, caseId?: string): ReportedSolution {
  const { circuit, caseName } = reportedCircuit(base, caseId);
  const names = circuitNames(circuit);
  try {
    return { circuit, caseName, names, result: solveCircuit(circuit), failure: null };
  } catch (err) {
    if (!(err instanceof EngineError)) throw err;
    return { circuit, caseName, names, result: null, failure: names.text(err.message) };
  }
}

/** Leaf parameters of a drawn element, in words ("every phase › P (kW): 1.5"). */
export function parameterLines(e: Record<string, unknown>, names: CircuitNames): string {
  const out: string[] = [];
  const walk = (v: unknown, path: string) => {
    if (path.endsWith('opened') && v && typeof v === 'object') {
      for (const [field, cs] of Object.entries(v as Record<string, unknown>)) out.push(`${parameterWords(`opened.${field}`)}: ${valueWords(`opened.${field}`, cs, names)}`);
      return;
    }
    if (v !== null && typeof v === 'object' && !Array.isArray(v) && complexText(v) === null) {
      for (const [k, x] of Object.entries(v as Record<string, unknown>)) walk(x, path ? `${path}.${k}` : k);
      return;
    }
    out.push(`${parameterWords(path)}: ${valueWords(path, v, names)}`);
  };
  for (const [k, v] of Object.entries(e)) if (k !== 'id' && k !== 'type') walk(v, k);
  return out.join('; ');
}

/** What the report says in place of the diagram and the inputs of a revision with no element. */
export const NOTHING_DRAWN = 'Nothing is drawn in this revision yet.';

/** The input table of each element kind: a title ("Loads") and rows of name and parameters. */
export function inputGroups(circuit: unknown): { title: string; rows: [string, string][] }[] {
  const names = circuitNames(circuit);
  const byType = new Map<string, [string, string][]>();
  for (const [id, e] of drawnElements(circuit)) {
    const word = typeWord(e.type);
    byType.set(word, [...(byType.get(word) ?? []), [id, parameterLines(e, names)]]);
  }
  return [...byType].map(([word, rows]) => ({ title: `${word[0].toUpperCase()}${word.slice(1)}s`, rows }));
}

/** The scope and assumptions, one sentence each. */
export function scopeLines(circuit: Record<string, unknown>, result: CircuitResult | null, caseName: string | null): string[] {
  const loads = [...drawnElements(circuit).values()].filter((e) => e.type === 'load');
  const models = new Set<string>();
  for (const l of loads) {
    const specs = [l.each, l.total, ...Object.values((l.phases as Record<string, unknown>) ?? {})].filter(Boolean) as Record<string, unknown>[];
    for (const s of specs) {
      if ('ohms' in s || 'rOhms' in s) models.add('fixed impedance');
      else if ('kw' in s) {
        const m = s.model;
        models.add(typeof m === 'string' ? `P and Q at rated voltage, constant ${m}` : m && typeof m === 'object' ? 'P and Q at rated voltage, a ZIP mix' : 'P and Q at rated voltage, constant impedance');
      }
    }
  }
  return [
    `Circuit: ${caseName ? `the base circuit with the changes of case "${caseName}"` : 'the base circuit as drawn'}.`,
    `Frequency ${String(circuit.frequencyHz)} Hz; phase sequence ${result?.conventions.sequence ?? String(circuit.sequence ?? 'ABC')}.`,
    'Phasors are RMS, magnitude and angle in degrees; earth is the reference node.',
    'Complex power S = V·I*, load convention: Q > 0 is lagging. Sequence components with a = 1 at 120°.',
    'Transformer banks: the LV side lags the HV side by the clock number × 30° (IEC) or by 30° for delta–wye and wye–delta banks (North American rule), as each bank is set; a tap is on the HV winding.',
    ...(result ? [`Limit set: ${result.limits.name}. Neutral shift above ${result.limits.neutralShiftPercent} % of nominal and loading above ${result.limits.loadingPercent} % are warnings (common practice).`] : []),
    `Loads: ${models.size ? [...models].join('; ') : 'none'}. Each load is judged on the voltage across its own terminals against its own rating.`,
    'The solve is a complex nodal solution of the whole unbalanced network; no balance is assumed.',
  ];
}

/** The buses that carry a flag (as drawn), in the order of their first flag. */
export function flaggedBuses(result: CircuitResult, names: CircuitNames): CircuitResult['buses'] {
  const wanted = [...new Set(result.flags.map((f) => f.bus && names.drawnBus(f.bus)).filter((b): b is string => !!b))];
  return wanted.map((b) => result.buses.find((x) => x.bus === b)).filter((b) => b !== undefined);
}

/** The column groups the bus table is printed in (it is too wide for one page): line to neutral, line to line, the rest. */
export function busColumnGroups(columns: string[]): { title: string; columns: number[] }[] {
  const ln = columns.map((c, i) => ({ c, i })).filter(({ c, i }) => i < 2 || /–N|Neutral shift/.test(c)).map(({ i }) => i);
  const ll = [0, ...columns.map((c, i) => ({ c, i })).filter(({ c }) => /^[A-C12]–[A-C12] /.test(c)).map(({ i }) => i)];
  const rest = [0, ...columns.map((_, i) => i).filter((i) => !ln.includes(i) && !ll.includes(i))];
  return [
    { title: 'Bus voltages: line to neutral and neutral shift', columns: ln },
    { title: 'Bus voltages: line to line', columns: ll },
    { title: 'Bus voltages: sequence components and unbalance', columns: rest },
  ];
}
