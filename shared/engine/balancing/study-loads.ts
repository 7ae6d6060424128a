/**
 * Balancing a study's own loads: its single-phase kW loads between a phase and the neutral are the
 * customers (named as drawn), the rest of the circuit is the feeder; an assignment is written back
 * by changing only the phase those loads sit on.
 */
import type { CircuitInput } from '../schema/circuit.ts';
import { CustomerListError, type BalancePhase, type Customer } from './customers.ts';
import { customerLoad, type Assignment } from './feeder.ts';

type RawLoad = { type: string; id: string; bus?: string; connection?: string; between?: string[]; generation?: boolean; each?: { kw?: number; kvar?: number; model?: unknown } };

const MODEL: Record<string, Customer['model']> = { power: 'p', current: 'i', impedance: 'z' };

function customerOf(e: RawLoad): Customer | undefined {
  if (e.type !== 'load' || e.connection !== 'single' || e.generation || !e.bus || !e.between || e.between[1] !== 'n' || !['a', 'b', 'c'].includes(e.between[0])) return undefined;
  if (typeof e.each?.kw !== 'number') return undefined;
  const model = MODEL[(e.each.model as string | undefined) ?? 'impedance'];
  if (!model) return undefined; // a mixed ZIP load stays as it is
  return { customer: e.id, bus: e.bus, phase: e.between[0].toUpperCase() as BalancePhase, kw: e.each.kw, kvar: e.each.kvar ?? 0, fixed: false, model, allowed: ['A', 'B', 'C'] };
}

/** The feeder (the circuit without those loads) and the customers (those loads). Throws CustomerListError when there are none. */
export function customersFromCircuit(circuit: CircuitInput): { feeder: CircuitInput; customers: Customer[] } {
  const customers: Customer[] = [];
  const rest: CircuitInput['elements'] = [];
  for (const e of circuit.elements) {
    const c = customerOf(e as unknown as RawLoad);
    if (c) customers.push(c);
    else rest.push(e);
  }
  if (customers.length === 0) throw new CustomerListError([{ message: 'the study has no single-phase kW loads between a phase and the neutral to balance' }]);
  return { feeder: { ...circuit, elements: rest }, customers };
}

/** The circuit with each load named in the assignment moved to its phase (to the same neutral). */
export function applyAssignment<C extends CircuitInput>(circuit: C, assignment: Assignment): C {
  return {
    ...circuit,
    elements: circuit.elements.map((e) => {
      const phase = assignment[(e as { id: string }).id];
      const load = e as unknown as RawLoad;
      if (!phase || !customerOf(load)) return e;
      return { ...e, between: [phase.toLowerCase(), 'n'] };
    }),
  };
}

/**
 * The circuit after balancing an uploaded customer list: customers that are already loads of the
 * circuit (same name) move to their phase; the others are added as single-phase loads on theirs.
 */
export function applyCustomers<C extends CircuitInput>(circuit: C, customers: Customer[], assignment: Assignment): C {
  const ids = new Set(circuit.elements.map((e) => (e as { id: string }).id));
  const moved = applyAssignment(circuit, assignment);
  const added = customers.filter((c) => !ids.has(c.customer)).map((c) => customerLoad(c, assignment[c.customer] ?? c.phase));
  return { ...moved, elements: [...moved.elements, ...added] };
}
