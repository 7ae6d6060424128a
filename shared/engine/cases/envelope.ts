/**
 * The lost-neutral envelope: with the neutral already open in the circuit given (a case), every
 * single-phase kW load on one bus between a phase and the neutral is varied independently from
 * `fromFraction` to `toFraction` of its value (`steps` points each), and every combination solved.
 * Out: the locus of the bus's star point (neutral to earth), the worst over- and under-voltage of
 * each load (V and pu of its rated voltage), and the share of combinations that put any load
 * outside the violation band of the limit set in force. Loads given as impedances or R/L/C stay as
 * they are. Pure; a lost neutral is a hazard to remove, never a margin to use.
 */
import { InvalidCircuitError, EngineError } from '../errors.ts';
import type { CircuitInput } from '../schema/circuit.ts';
import { resolveLimits } from '../limits/limit-sets.ts';
import { solveCircuit } from '../solve-circuit.ts';
import { sweepValues } from './sweep-points.ts';

export interface EnvelopeOptions {
  bus: string;
  fromFraction?: number;
  toFraction?: number;
  steps?: number;
}

export interface EnvelopeLoad {
  id: string;
  phase: string;
  ratedVolts: number;
  maxVolts: number;
  minVolts: number;
  maxPu: number;
  minPu: number;
}

export interface LostNeutralEnvelope {
  bus: string;
  /** Combinations solved (failed ones excluded from everything below). */
  solved: number;
  failed: number;
  /** Star point (neutral to earth) of every solved combination, V. */
  locus: { re: number; im: number }[];
  loads: EnvelopeLoad[];
  /** Combinations with any load outside the violation band, over those solved (0…1). */
  outsideShare: number;
  violationPu: [number, number];
}

/** Largest number of combinations an envelope may solve. */
export const MAX_ENVELOPE_COMBINATIONS = 100_000;

type RawLoad = { type: string; id: string; bus: string; connection: string; between?: string[]; ratedVolts?: number; each?: { kw?: number; kvar?: number } };

/** Compute the envelope (see the file header). Throws InvalidCircuitError when the bus has no such loads. */
export function lostNeutralEnvelope(circuit: CircuitInput, opts: EnvelopeOptions): LostNeutralEnvelope {
  const steps = opts.steps ?? 5;
  const fractions = sweepValues({ from: opts.fromFraction ?? 0.1, to: opts.toFraction ?? 1, steps });
  const loads = (circuit.elements as unknown as RawLoad[]).filter(
    (e) => e.type === 'load' && e.bus === opts.bus && e.connection === 'single' && e.between?.includes('n') && typeof e.each?.kw === 'number',
  );
  if (loads.length === 0) {
    throw new InvalidCircuitError(`bus ${opts.bus}: no single-phase kW loads between a phase and the neutral to vary`, [{ path: 'bus', message: 'no loads to vary' }], { nodes: [opts.bus] });
  }
  const total = Math.pow(fractions.length, loads.length);
  if (total > MAX_ENVELOPE_COMBINATIONS) throw new InvalidCircuitError(`the envelope would solve ${total} combinations (more than ${MAX_ENVELOPE_COMBINATIONS}); use fewer steps`, [{ path: 'steps', message: 'too many combinations' }]);
  const limits = resolveLimits(circuit.limits);
  const [lo, hi] = limits.voltageViolationPu;
  const stats = loads.map(() => ({ max: -Infinity, min: Infinity, rated: NaN }));
  const locus: { re: number; im: number }[] = [];
  let failed = 0;
  let outside = 0;
  const index = loads.map(() => 0);
  for (let k = 0; k < total; k++) {
    // combination k: mixed-radix digits, one per load
    let rest = k;
    for (let j = loads.length - 1; j >= 0; j--) {
      index[j] = rest % fractions.length;
      rest = Math.floor(rest / fractions.length);
    }
    const scaled = new Map(loads.map((l, j) => [l.id, fractions[index[j]]]));
    const elements = circuit.elements.map((e) => {
      const f = scaled.get(e.id);
      if (f === undefined) return e;
      const l = e as unknown as RawLoad;
      return { ...l, each: { ...l.each, kw: l.each!.kw! * f, ...(l.each!.kvar !== undefined ? { kvar: l.each!.kvar * f } : {}) } } as unknown as typeof e;
    });
    let r;
    try {
      r = solveCircuit({ ...circuit, elements });
    } catch (e) {
      if (!(e instanceof EngineError)) throw e;
      failed++;
      continue;
    }
    const bus = r.buses.find((b) => b.bus === opts.bus);
    const vn = r.nodes[`${opts.bus}.n`];
    if (vn) locus.push({ re: vn.re, im: vn.im });
    let any = false;
    loads.forEach((l, j) => {
      const phase = l.between!.find((c) => c !== 'n')!;
      const vp = r.nodes[`${opts.bus}.${phase}`];
      const v = Math.hypot(vp.re - (vn?.re ?? 0), vp.im - (vn?.im ?? 0));
      const rated = l.ratedVolts ?? bus?.nominalVLN ?? NaN;
      const s = stats[j];
      s.rated = rated;
      s.max = Math.max(s.max, v);
      s.min = Math.min(s.min, v);
      if (v / rated < lo || v / rated > hi) any = true;
    });
    if (any) outside++;
  }
  const solved = total - failed;
  return {
    bus: opts.bus,
    solved,
    failed,
    locus,
    loads: loads.map((l, j) => ({
      id: l.id,
      phase: l.between!.find((c) => c !== 'n')!,
      ratedVolts: stats[j].rated,
      maxVolts: stats[j].max,
      minVolts: stats[j].min,
      maxPu: stats[j].max / stats[j].rated,
      minPu: stats[j].min / stats[j].rated,
    })),
    outsideShare: solved ? outside / solved : 0,
    violationPu: [lo, hi],
  };
}
