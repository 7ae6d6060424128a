/**
 * The feeder a customer list is balanced on: its buses in order along the feeder from the source
 * (breadth-first over lines, switches and transformer banks), the phases and neutral each bus has,
 * the customers added to it as single-phase loads between their phase and the bus neutral, and the
 * rotating-rule assignment (A, B, C, A, … in feeder order) planners use as the customary baseline.
 */
import type { CircuitInput } from '../schema/circuit.ts';
import { parseCircuit } from '../schema/parse-circuit.ts';
import { solveCircuit } from '../solve-circuit.ts';
import { BALANCE_PHASES, CustomerListError, type BalancePhase, type Customer, type CustomerIssue } from './customers.ts';

/** A customer → phase assignment. */
export type Assignment = Record<string, BalancePhase>;

/** A series element joining two buses, oriented away from the source. */
export interface FeederEdge {
  id: string;
  /** Index of the element's port on the upstream (source) side. */
  upstreamPort: number;
  upstream: string;
  downstream: string;
}

export interface BalanceFeeder {
  /** The feeder circuit as given (customers are added to a copy). */
  circuit: CircuitInput;
  sourceBus: string;
  /** Buses in breadth-first order from the source. */
  order: string[];
  /** Edges out of each bus, away from the source. */
  children: Map<string, FeederEdge[]>;
  /** Phases (A, B, C) present at each bus. */
  busPhases: Map<string, BalancePhase[]>;
  /** Buses that have a neutral conductor. */
  neutralBuses: Set<string>;
}

type RawElement = { type: string; id: string; bus?: string; from?: string; to?: string };

/** Analyse a feeder circuit (validated; solved once to learn each bus's conductors). Throws the engine's errors. */
export function analyseFeeder(input: unknown): BalanceFeeder {
  const parsed = parseCircuit(input);
  const circuit = structuredClone(input) as CircuitInput;
  const elements = parsed.elements as unknown as RawElement[];
  const source = elements.find((e) => e.type === 'source' || e.type === 'splitPhaseSource');
  if (!source?.bus) throw new CustomerListError([{ message: 'the feeder has no three-phase source to balance against' }]);
  const result = solveCircuit(circuit);
  const busPhases = new Map<string, BalancePhase[]>();
  const neutralBuses = new Set<string>();
  for (const b of result.buses) {
    if (b.kind !== 'threePhase') continue;
    busPhases.set(b.bus, BALANCE_PHASES.filter((p) => b.conductors.includes(p.toLowerCase())));
    if (b.conductors.includes('n')) neutralBuses.add(b.bus);
  }
  const adjacent = new Map<string, { id: string; port: number; other: string }[]>();
  const link = (a: string, b: string, id: string, port: number) => {
    const list = adjacent.get(a) ?? [];
    list.push({ id, port, other: b });
    adjacent.set(a, list);
  };
  for (const e of elements) {
    if ((e.type === 'line' || e.type === 'switch3' || e.type === 'transformer') && e.from && e.to) {
      link(e.from, e.to, e.id, 0);
      link(e.to, e.from, e.id, 1);
    }
  }
  const order = [source.bus];
  const children = new Map<string, FeederEdge[]>();
  const seen = new Set(order);
  for (let k = 0; k < order.length; k++) {
    const bus = order[k];
    for (const a of adjacent.get(bus) ?? []) {
      if (seen.has(a.other)) continue;
      seen.add(a.other);
      order.push(a.other);
      const list = children.get(bus) ?? [];
      list.push({ id: a.id, upstreamPort: a.port, upstream: bus, downstream: a.other });
      children.set(bus, list);
    }
  }
  return { circuit, sourceBus: source.bus, order, children, busPhases, neutralBuses };
}

/** Phases a customer may take on this feeder: its own allowed phases that its bus has. */
export function allowedPhases(feeder: BalanceFeeder, c: Customer): BalancePhase[] {
  if (c.fixed) return [c.phase];
  const present = feeder.busPhases.get(c.bus) ?? [];
  return c.allowed.filter((p) => present.includes(p));
}

/** Check customers against the feeder (bus exists, has the phase and a neutral, names free). Throws CustomerListError. */
export function checkCustomers(feeder: BalanceFeeder, customers: Customer[]): void {
  const issues: CustomerIssue[] = [];
  const ids = new Set((feeder.circuit.elements as unknown as RawElement[]).map((e) => e.id));
  for (const c of customers) {
    const row = c.row;
    const phases = feeder.busPhases.get(c.bus);
    if (ids.has(c.customer)) issues.push({ row, column: 'customer', message: `"${c.customer}" is already the name of an element of the feeder; give the customer another name` });
    if (!phases) {
      issues.push({ row, column: 'bus', message: `the feeder has no three-phase bus "${c.bus}"` });
      continue;
    }
    if (!feeder.neutralBuses.has(c.bus)) issues.push({ row, column: 'bus', message: `bus ${c.bus} has no neutral; customers connect between a phase and the neutral` });
    if (!phases.includes(c.phase)) issues.push({ row, column: 'phase', message: `bus ${c.bus} has no phase ${c.phase} (it has ${phases.join(', ') || 'none'})` });
    else if (allowedPhases(feeder, c).length === 0) issues.push({ row, column: 'phases', message: `none of the allowed phases is present at bus ${c.bus}` });
  }
  if (issues.length) throw new CustomerListError(issues);
}

/** The customers' phases as they are now. */
export function currentAssignment(customers: Customer[]): Assignment {
  return Object.fromEntries(customers.map((c) => [c.customer, c.phase]));
}

const MODEL: Record<Customer['model'], 'impedance' | 'current' | 'power'> = { z: 'impedance', i: 'current', p: 'power' };

/** A customer as a single-phase load (named as the customer) between a phase and its bus neutral. */
export function customerLoad(c: Customer, phase: BalancePhase) {
  return {
    type: 'load' as const,
    id: c.customer,
    bus: c.bus,
    connection: 'single' as const,
    between: [phase.toLowerCase() as 'a' | 'b' | 'c', 'n' as const] as ['a', 'n'],
    each: { kw: c.kw, kvar: c.kvar, model: MODEL[c.model] },
  };
}

/** A copy of the feeder circuit with each customer as a single-phase load between its assigned phase and the bus neutral. */
export function withCustomers(feeder: BalanceFeeder, customers: Customer[], assignment: Assignment): CircuitInput {
  const loads = customers.map((c) => customerLoad(c, assignment[c.customer] ?? c.phase));
  return { ...feeder.circuit, elements: [...feeder.circuit.elements, ...loads] };
}

/**
 * The rotating rule: customers in feeder order (bus order from the source, then list order) take
 * A, B, C, A, … in turn; a customer that cannot take the next phase (fixed, or its bus lacks it)
 * keeps or takes the next phase it can, and the rotation goes on from there.
 */
export function rotatingRule(feeder: BalanceFeeder, customers: Customer[]): Assignment {
  const rank = new Map(feeder.order.map((b, i) => [b, i]));
  const sorted = customers.map((c, i) => ({ c, i })).sort((x, y) => (rank.get(x.c.bus)! - rank.get(y.c.bus)!) || x.i - y.i);
  const out: Assignment = {};
  let next = 0;
  for (const { c } of sorted) {
    const allowed = allowedPhases(feeder, c);
    if (c.fixed) {
      out[c.customer] = c.phase;
      continue;
    }
    let k = 0;
    while (k < 3 && !allowed.includes(BALANCE_PHASES[(next + k) % 3])) k++;
    const p = BALANCE_PHASES[(next + k) % 3];
    out[c.customer] = p;
    next = (next + k + 1) % 3;
  }
  return out;
}
