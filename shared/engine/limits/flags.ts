/** Flags: bus voltages, unbalance, neutral shift and transformer loading against a limit set. */
import type { FloatingIsland } from '../types.ts';
import type { BusResult, ElementResult, Flag } from '../results/types.ts';
import type { LimitSet } from './limit-sets.ts';

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
export function computeFlags(buses: BusResult[], elements: ElementResult[], floating: FloatingIsland[], limits: LimitSet, lowVoltageLoads: readonly LowVoltageLoadBranch[] = []): Flag[] {
  const flags: Flag[] = [];
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
    const u = limits.unbalanceMetric === 'iec' ? bus.iecUnbalancePercent : limits.unbalanceMetric === 'nema' ? bus.nemaUnbalancePercent : bus.ieeeUnbalancePercent;
    if (u !== undefined && Number.isFinite(u) && u > limits.unbalancePercent) {
      const name = limits.unbalanceMetric === 'iec' ? 'IEC |V2|/|V1|' : limits.unbalanceMetric === 'nema' ? 'line-voltage (NEMA)' : 'phase-voltage (IEEE)';
      flags.push({ severity: 'warning', code: 'unbalance', bus: bus.bus, value: u, limit: limits.unbalancePercent, unit: '%', message: `bus ${bus.bus}: ${name} unbalance ${u.toFixed(2)} % exceeds ${limits.unbalancePercent} %` });
    }
    if (!bus.floating && bus.neutralShiftPercent !== undefined && bus.neutralShiftPercent > limits.neutralShiftPercent) {
      flags.push({
        severity: 'warning',
        code: 'neutral-shift',
        bus: bus.bus,
        conductor: 'n',
        value: bus.neutralShiftPercent,
        limit: limits.neutralShiftPercent,
        unit: '%',
        message: `bus ${bus.bus}: neutral-to-earth voltage ${f1(bus.neutralToEarth!.mag)} V is ${bus.neutralShiftPercent.toFixed(1)} % of nominal (limit ${limits.neutralShiftPercent} %): check for a lost or high-impedance neutral`,
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
