/**
 * The summary of key results kept with every revision: bus voltages, neutral currents, neutral
 * shifts, unbalance and flags, or the engine's error when the circuit cannot be solved. Small and
 * JSON-serialisable, so two revisions can be compared without solving either again.
 * Pure TypeScript (no Node or DOM APIs): used by the server and the browser alike.
 */
import type { CircuitResult, Flag } from '../engine/index.ts';
import { EngineError, solveCircuit } from '../engine/index.ts';

/** One bus: phase (or leg) to neutral magnitudes in V, neutral shift in V and %, unbalance in %. */
export interface BusSummary {
  bus: string;
  kind: 'threePhase' | 'splitPhase';
  /** Nominal line-to-neutral voltage, V. */
  nominalVLN?: number;
  /** |V| phase (or leg) to neutral (to earth when the bus has no neutral), V, by conductor a/b/c/1/2. */
  phaseVolts: Record<string, number>;
  /** |V neutral-to-earth|, V. */
  neutralShiftVolts?: number;
  /** Neutral shift in % of nominal V_LN. */
  neutralShiftPercent?: number;
  /** IEC unbalance |V2|/|V1|, %. */
  iecUnbalancePercent?: number;
  /** NEMA line-voltage unbalance, %. */
  nemaUnbalancePercent?: number;
}

/** |I| in the neutral conductor of an element at one bus, A. `key` = `elementId@bus`. */
export interface NeutralCurrentSummary {
  key: string;
  elementId: string;
  bus: string;
  amps: number;
}

/** A flag with a stable key (code, bus, element, conductor) so revisions can be compared. */
export interface FlagSummary {
  key: string;
  severity: Flag['severity'];
  code: Flag['code'];
  bus?: string;
  elementId?: string;
  conductor?: string;
  value: number;
  limit?: number;
  unit: string;
  message: string;
}

export type ResultsSummary =
  | { ok: true; buses: BusSummary[]; neutralCurrents: NeutralCurrentSummary[]; flags: FlagSummary[] }
  | { ok: false; error: { code: string; message: string; elementIds: string[] } };

/** Values are kept to 4 significant decimals' worth: enough for a review, small to store. */
function round(x: number): number {
  return Number.isFinite(x) ? Math.round(x * 1e4) / 1e4 : x;
}

/** The stable identity of a flag across revisions. */
export function flagKey(f: Pick<Flag, 'code' | 'bus' | 'elementId' | 'conductor' | 'metric'>): string {
  // An unbalance flag per definition: the definition is part of its identity.
  return [f.code, f.bus ?? '', f.elementId ?? '', f.conductor ?? '', ...(f.metric ? [f.metric] : [])].join('|');
}

/** Extracts the summary from an engine result. */
export function summarizeResult(r: CircuitResult): ResultsSummary {
  const buses: BusSummary[] = r.buses.map((b) => {
    const phaseVolts: Record<string, number> = {};
    for (const [k, v] of Object.entries(b.lineToNeutral)) phaseVolts[k] = round(v.mag);
    return {
      bus: b.bus,
      kind: b.kind,
      ...(b.nominalVLN !== undefined ? { nominalVLN: round(b.nominalVLN) } : {}),
      phaseVolts,
      ...(b.neutralToEarth ? { neutralShiftVolts: round(b.neutralToEarth.mag) } : {}),
      ...(b.neutralShiftPercent !== undefined ? { neutralShiftPercent: round(b.neutralShiftPercent) } : {}),
      ...(b.iecUnbalancePercent !== undefined ? { iecUnbalancePercent: round(b.iecUnbalancePercent) } : {}),
      ...(b.nemaUnbalancePercent !== undefined ? { nemaUnbalancePercent: round(b.nemaUnbalancePercent) } : {}),
    };
  });
  const neutralCurrents: NeutralCurrentSummary[] = [];
  for (const e of Object.values(r.elements)) {
    // Series elements (lines, transformers, switches) carry the neutral between buses; loads draw it.
    if (e.category !== 'series' && e.category !== 'load') continue;
    for (const p of e.ports ?? []) {
      const i = p.conductors.indexOf('n');
      if (i < 0 || !p.bus) continue;
      const key = `${e.id}@${p.bus}`;
      if (neutralCurrents.some((n) => n.key === key)) continue;
      neutralCurrents.push({ key, elementId: e.id, bus: p.bus, amps: round(p.currents[i].mag) });
    }
  }
  const flags: FlagSummary[] = r.flags.map((f) => ({
    key: flagKey(f),
    severity: f.severity,
    code: f.code,
    ...(f.bus !== undefined ? { bus: f.bus } : {}),
    ...(f.elementId !== undefined ? { elementId: f.elementId } : {}),
    ...(f.conductor !== undefined ? { conductor: f.conductor } : {}),
    value: round(f.value),
    ...(f.limit !== undefined ? { limit: round(f.limit) } : {}),
    unit: f.unit,
    message: f.message,
  }));
  return { ok: true, buses, neutralCurrents, flags };
}

/** Solves a circuit and summarises it; an engine error becomes `{ ok: false, error }` (never throws for engine errors). */
export function summarizeCircuit(circuit: unknown): ResultsSummary {
  try {
    return summarizeResult(solveCircuit(circuit));
  } catch (err) {
    if (err instanceof EngineError) return { ok: false, error: { code: err.code, message: err.message, elementIds: err.elementIds } };
    throw err;
  }
}
