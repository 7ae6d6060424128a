/** Flags: bus voltages, load terminal voltages, unbalance, neutral shift and transformer loading against a limit set. */
import type { FloatingIsland } from '../types.ts';
import type { BusResult, ElementResult, Flag, LoadResult, NeutralCause } from '../results/types.ts';
import { UNBALANCE_METRICS, type LimitSet, type UnbalanceMetric } from './limit-values.ts';

/** Names of the unbalance definitions, as flags and reports word them. */
export const UNBALANCE_NAMES: Record<UnbalanceMetric, string> = { iec: 'IEC |V2|/|V1|', nema: 'line-voltage (NEMA)', ieee: 'phase-voltage (IEEE)' };

/** Value of one unbalance definition at a bus, %. */
export function unbalanceOf(bus: BusResult, metric: UnbalanceMetric): number | undefined {
  return metric === 'iec' ? bus.iecUnbalancePercent : metric === 'nema' ? bus.nemaUnbalancePercent : bus.ieeeUnbalancePercent;
}

/**
 * What a neutral shift means, by its cause (see results/neutral-cause.ts). The opened lines and
 * switches are in `BusResult.neutralOpenAt`, not in the words: a switch may carry a name its
 * author generated, and screens name it their own way.
 */
export function neutralCauseWords(cause: NeutralCause | undefined): string {
  switch (cause) {
    case 'open-neutral':
      return "the neutral is open upstream (an opened neutral conductor cuts this bus off from the source neutral): the loads' star point has moved, so some loads see far more than their rating and others far less";
    case 'floating-neutral':
      return "this bus's neutral is not joined to any source neutral (a floating neutral): the loads' star point is free to move";
    case 'fault':
      return "the fault in this study drives current through the neutral and earth paths; this is the fault's effect, not a lost neutral";
    case 'unbalance':
      return 'the neutral is intact; unbalanced load current through the neutral conductor and earthing raises it: check the neutral size, length and earthing';
    default:
      return 'check the neutral path';
  }
}

/** Branch of a load in words: "c–n", "a to its own star point". */
function branchWords(fromC: string, toC: string): string {
  return toC === 'star' ? `${fromC} to its own star point` : `${fromC}–${toC}`;
}

/** Flags of loads whose own terminal voltage is outside the limit set's bands (pu of the load's rating). */
function loadVoltageFlags(loads: readonly LoadResult[], limits: LimitSet): Flag[] {
  const flags: Flag[] = [];
  for (const l of loads) {
    for (const b of l.branches) {
      if (b.pu === undefined || b.ratedVolts === undefined || b.status === 'ok' || b.status === 'unrated') continue;
      const severity: Flag['severity'] = b.status.startsWith('violation') ? 'violation' : 'warning';
      const high = b.status.endsWith('high');
      const band = severity === 'violation' ? limits.voltageViolationPu : limits.voltageWarningPu;
      const limit = high ? band[1] : band[0];
      const what = l.branches.length > 1 ? `load ${l.id} (${branchWords(b.fromConductor, b.toConductor)})` : `load ${l.id}`;
      flags.push({
        severity,
        code: high ? 'load-voltage-high' : 'load-voltage-low',
        elementId: l.id,
        conductor: b.branch,
        value: b.voltage.mag,
        limit: limit * b.ratedVolts,
        unit: 'V',
        message: `${what} has ${f1(b.voltage.mag)} V across its terminals = ${f3(b.pu)} pu of its ${f1(b.ratedVolts)} V rating, ${high ? 'above' : 'below'} the ${severity} limit ${f3(limit)} pu`,
      });
    }
  }
  return flags;
}

const f3 = (x: number) => x.toFixed(3);
const f1 = (x: number) => x.toFixed(1);

/** Voltage flags of one bus (phase-to-neutral where there is a neutral, else line-to-line). */
function voltageFlags(bus: BusResult, limits: LimitSet): Flag[] {
  const flags: Flag[] = [];
  const useLn = bus.kind === 'splitPhase' || bus.lnReference === 'neutral';
  const nominal = useLn ? bus.nominalVLN : bus.nominalVLL;
  if (!nominal) return flags;
  const values = useLn ? bus.lineToNeutral : bus.lineToLine;
  for (const [k, v] of Object.entries(values)) {
    const pu = v.mag / nominal;
    const [wl, wh] = limits.voltageWarningPu;
    const [vl, vh] = limits.voltageViolationPu;
    const what = useLn ? `${k}-n` : k;
    let severity: Flag['severity'] | null = null;
    let limit = 0;
    if (pu < vl || pu > vh) {
      severity = 'violation';
      limit = pu < vl ? vl : vh;
    } else if (pu < wl || pu > wh) {
      severity = 'warning';
      limit = pu < wl ? wl : wh;
    }
    if (severity) {
      const low = pu < 1;
      flags.push({
        severity,
        code: low ? 'voltage-low' : 'voltage-high',
        bus: bus.bus,
        conductor: k,
        value: v.mag,
        limit: limit * nominal,
        unit: 'V',
        message: `bus ${bus.bus} ${what}: ${f1(v.mag)} V = ${f3(pu)} pu is ${low ? 'below' : 'above'} the ${severity} limit ${f3(limit)} pu (${f1(limit * nominal)} V)`,
      });
    }
  }
  return flags;
}

/** A voltage-dependent load branch solved below the low-voltage threshold (from the solver's lowVoltageLoads). */
export interface LowVoltageLoadBranch {
  /** The load element (block) id. */
  elementId: string;
  /** Its branch label ('a', 'ab', '1', …), when the block has several. */
  branch?: string;
  /** Terminal voltage, V, and per unit of the branch's rated voltage. */
  volts: number;
  voltsPu: number;
  /** The threshold in force, per unit. */
  lowVoltagePu: number;
}

/** All flags for the buses and elements of a result. */
export function computeFlags(buses: BusResult[], elements: ElementResult[], floating: FloatingIsland[], limits: LimitSet, lowVoltageLoads: readonly LowVoltageLoadBranch[] = [], loads: readonly LoadResult[] = []): Flag[] {
  const flags: Flag[] = [];
  flags.push(...loadVoltageFlags(loads, limits));
  // A ZIP load below the threshold no longer draws its stated constant-current / constant-power
  // share: the solver turned those parts into constant impedance there (common practice (P),
  // default 0.7 pu), so its power is less than asked for. Say so next to the load.
  for (const l of lowVoltageLoads) {
    const what = l.branch ? `load ${l.elementId} (${l.branch})` : `load ${l.elementId}`;
    flags.push({
      severity: 'warning',
      code: 'load-low-voltage',
      elementId: l.elementId,
      ...(l.branch ? { conductor: l.branch } : {}),
      value: l.voltsPu,
      limit: l.lowVoltagePu,
      unit: 'pu',
      message: `${what} sees ${f1(l.volts)} V = ${f3(l.voltsPu)} pu of its rated voltage, below ${l.lowVoltagePu} pu: its constant-current and constant-power parts were converted to constant impedance (it draws less than its rated kW/kvar)`,
    });
  }
  for (const bus of buses) {
    flags.push(...voltageFlags(bus, limits));
    // Every definition against its own limit, the set's own definition first.
    for (const metric of [limits.unbalanceMetric, ...UNBALANCE_METRICS.filter((m) => m !== limits.unbalanceMetric)]) {
      const u = unbalanceOf(bus, metric);
      const limit = limits.unbalanceLimits[metric];
      if (u === undefined || !(u > limit)) continue;
      flags.push({ severity: 'warning', code: 'unbalance', metric, bus: bus.bus, value: u, limit, unit: '%', message: `bus ${bus.bus}: ${UNBALANCE_NAMES[metric]} unbalance ${Number.isFinite(u) ? u.toFixed(2) : u} % exceeds ${limit} %` });
    }
    if (!bus.floating && bus.neutralShiftPercent !== undefined && bus.neutralShiftPercent > limits.neutralShiftPercent) {
      flags.push({
        severity: 'warning',
        code: 'neutral-shift',
        ...(bus.neutralCause ? { cause: bus.neutralCause } : {}),
        bus: bus.bus,
        conductor: 'n',
        value: bus.neutralShiftPercent,
        limit: limits.neutralShiftPercent,
        unit: '%',
        message: `bus ${bus.bus}: neutral-to-earth voltage ${f1(bus.neutralToEarth!.mag)} V is ${bus.neutralShiftPercent.toFixed(1)} % of nominal (limit ${limits.neutralShiftPercent} %): ${neutralCauseWords(bus.neutralCause)}`,
      });
    }
  }
  for (const el of elements) {
    if (el.loadingPercent !== undefined && el.loadingPercent > limits.loadingPercent) {
      flags.push({ severity: 'warning', code: 'overload', elementId: el.id, value: el.loadingPercent, limit: limits.loadingPercent, unit: '%', message: `transformer ${el.id} is loaded to ${el.loadingPercent.toFixed(1)} % of its rating` });
    }
  }
  for (const island of floating) {
    flags.push({
      severity: 'info',
      code: 'floating',
      value: island.nodes.length,
      unit: 'nodes',
      message: `${island.nodes.length} node(s) have no path to earth (${island.nodes.slice(0, 4).join(', ')}${island.nodes.length > 4 ? ', …' : ''}); their voltages to earth are referred to ${island.referenceNode} = 0 V`,
    });
  }
  return flags;
}
