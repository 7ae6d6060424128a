/**
 * What a phase assignment does on the feeder, from one exact solve of the engine: the neutral
 * current at the measuring point, the worst voltage unbalance by each definition (IEC |V2|/|V1|,
 * line-voltage NEMA, phase-voltage IEEE; the engine's own bus results), the losses, and each
 * customer's voltage at its own terminals in per unit of its rating. The same figures are also
 * computed from an *observation* (the complex quantities they are made of, see linear-model.ts)
 * so the optimiser can predict them.
 */
import type { Cx } from '../types.ts';
import { abs, add, sub } from '../phasor.ts';
import type { CircuitResult } from '../results/types.ts';
import { iecUnbalancePercent, maxDeviationUnbalancePercent } from '../metrics/unbalance.ts';
import { solveCircuit } from '../solve-circuit.ts';
import { CustomerListError, type BalancePhase, type Customer } from './customers.ts';
import { withCustomers, type Assignment, type BalanceFeeder, type FeederEdge } from './feeder.ts';

/** The figures of one assignment (the keys of the CLI's `before` / `after` / `rotatingRule`). */
export interface BalanceFigures {
  neutralCurrentA: number;
  maxUnbalancePercent: { iec: number; nema: number; ieee: number };
  lossesKw: number;
  minCustomerVoltagePu: number;
  maxCustomerVoltagePu: number;
}

/** A customer's voltage across its own terminals. */
export interface CustomerVoltage {
  customer: string;
  bus: string;
  phase: BalancePhase;
  volts: number;
  pu: number;
}

/** Where the neutral current is measured: the neutral conductor of these edges, at these ports. */
export interface NeutralPoint {
  bus: string;
  /** 'out': leaving the bus away from the source (the source bus); 'in': arriving at the bus. */
  direction: 'out' | 'in';
  edges: { id: string; port: number }[];
}

const hasNeutral = (r: CircuitResult, id: string, port: number) => r.elements[id]?.ports?.[port]?.conductors.includes('n') ?? false;

/** "; did you mean "WC3"?" for a name that differs only in case, else "; its buses are WC0, WC1, …" (at most 12). */
function busHint(buses: string[], asked: string): string {
  const same = buses.find((b) => b.toLowerCase() === asked.trim().toLowerCase());
  if (same) return `; did you mean "${same}"?`;
  return `; its buses are ${buses.slice(0, 12).join(', ')}${buses.length > 12 ? ', …' : ''}`;
}

/**
 * The measuring point: at the source, the neutral conductors leaving the source bus (past a
 * transformer bank without a neutral on its primary side, the lines leaving its secondary); at any
 * other bus, the neutral conductor arriving at it from the source side. Throws when there is none.
 */
export function neutralPoint(feeder: BalanceFeeder, base: CircuitResult, bus?: string): NeutralPoint {
  if (bus !== undefined && bus !== feeder.sourceBus) {
    if (!feeder.order.includes(bus)) throw new CustomerListError([{ message: `the feeder has no bus "${bus}" to measure the neutral current at${busHint(feeder.order, bus)}` }]);
    let parent: FeederEdge | undefined;
    for (const list of feeder.children.values()) parent ??= list.find((e) => e.downstream === bus);
    const port = 1 - parent!.upstreamPort;
    if (!hasNeutral(base, parent!.id, port)) throw new CustomerListError([{ message: `the connection into bus ${bus} has no neutral conductor to measure` }]);
    return { bus, direction: 'in', edges: [{ id: parent!.id, port }] };
  }
  let at = feeder.sourceBus;
  for (;;) {
    const out = feeder.children.get(at) ?? [];
    const withN = out.filter((e) => hasNeutral(base, e.id, e.upstreamPort));
    if (withN.length) return { bus: at, direction: 'out', edges: withN.map((e) => ({ id: e.id, port: e.upstreamPort })) };
    if (out.length !== 1) throw new CustomerListError([{ message: `no neutral conductor leaves the source bus ${feeder.sourceBus}; give --bus` }]);
    at = out[0].downstream;
  }
}

/** The complex neutral current at the measuring point, A. */
export function neutralCurrent(r: CircuitResult, point: NeutralPoint): Cx {
  let sum: Cx = { re: 0, im: 0 };
  for (const e of point.edges) {
    const port = r.elements[e.id].ports![e.port];
    sum = add(sum, port.currents[port.conductors.indexOf('n')]);
  }
  return sum;
}

/** The phase and neutral currents at the measuring point (summed over its edges), A, complex. */
export function pointCurrents(r: CircuitResult, point: NeutralPoint): Record<'a' | 'b' | 'c' | 'n', Cx> {
  const out: Record<'a' | 'b' | 'c' | 'n', Cx> = { a: { re: 0, im: 0 }, b: { re: 0, im: 0 }, c: { re: 0, im: 0 }, n: { re: 0, im: 0 } };
  for (const e of point.edges) {
    const port = r.elements[e.id].ports![e.port];
    port.conductors.forEach((k, i) => {
      if (k in out) out[k as keyof typeof out] = add(out[k as keyof typeof out], port.currents[i]);
    });
  }
  return out;
}

/** Figures of a solved circuit holding these customers (exact: the engine's own results). */
export function exactFigures(r: CircuitResult, customers: Customer[], point: NeutralPoint): { figures: BalanceFigures; voltages: CustomerVoltage[] } {
  const worst = { iec: 0, nema: 0, ieee: 0 };
  for (const b of r.buses) {
    if (b.iecUnbalancePercent !== undefined) worst.iec = Math.max(worst.iec, b.iecUnbalancePercent);
    if (b.nemaUnbalancePercent !== undefined) worst.nema = Math.max(worst.nema, b.nemaUnbalancePercent);
    if (b.ieeeUnbalancePercent !== undefined) worst.ieee = Math.max(worst.ieee, b.ieeeUnbalancePercent);
  }
  const byId = new Map(r.loads.map((l) => [l.id, l]));
  const voltages = customers.map((c) => {
    const br = byId.get(c.customer)!.branches[0];
    return { customer: c.customer, bus: c.bus, phase: br.fromConductor.toUpperCase() as BalancePhase, volts: br.voltage.mag, pu: br.pu ?? NaN };
  });
  const pus = voltages.map((v) => v.pu);
  return {
    figures: {
      neutralCurrentA: abs(neutralCurrent(r, point)),
      maxUnbalancePercent: worst,
      lossesKw: r.totals.losses.re / 1000,
      minCustomerVoltagePu: Math.min(...pus),
      maxCustomerVoltagePu: Math.max(...pus),
    },
    voltages,
  };
}

/** Solve the feeder with the customers on these phases. Throws the engine's errors. */
export function solveAssignment(feeder: BalanceFeeder, customers: Customer[], assignment: Assignment): CircuitResult {
  return solveCircuit(withCustomers(feeder, customers, assignment));
}

/** Max deviation unbalance of three complex voltages' magnitudes, % (NEMA on line, IEEE on phase voltages). */
export const deviationOf = (v: readonly Cx[]) => maxDeviationUnbalancePercent(v.map(abs));
export { iecUnbalancePercent, sub };
