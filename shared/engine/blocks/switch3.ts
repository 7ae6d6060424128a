/**
 * Multi-conductor switch or bus tie between two buses: one switch primitive `<id>/<conductor>` per
 * conductor, closed when the switch is closed and the conductor is not listed in `open`.
 */
import { InvalidCircuitError } from '../errors.ts';
import type { Circuit } from '../schema/circuit.ts';
import { busNode, type Expansion } from './expansion.ts';

type Switch3 = Extract<Circuit['elements'][number], { type: 'switch3' }>;

/** Expand a multi-conductor switch into one switch per conductor. */
export function expandSwitch3(el: Switch3): Expansion {
  if (el.from === el.to) throw new InvalidCircuitError(`switch3 ${el.id}: "from" and "to" must be different buses`, [], { elementIds: [el.id] });
  if (new Set(el.conductors).size !== el.conductors.length) throw new InvalidCircuitError(`switch3 ${el.id}: conductors must be distinct`, [], { elementIds: [el.id] });
  for (const c of el.open) if (!el.conductors.includes(c)) throw new InvalidCircuitError(`switch3 ${el.id}: cannot open "${c}", not one of its conductors`, [], { elementIds: [el.id] });
  return {
    id: el.id,
    type: 'switch3',
    category: 'series',
    primitives: el.conductors.map((c) => ({
      prim: { type: 'switch', id: `${el.id}/${c}`, from: busNode(el.from, c), to: busNode(el.to, c), closed: el.closed && !el.open.includes(c) },
    })),
    ports: [
      { bus: el.from, conductors: [...el.conductors], nodes: el.conductors.map((c) => busNode(el.from, c)) },
      { bus: el.to, conductors: [...el.conductors], nodes: el.conductors.map((c) => busNode(el.to, c)) },
    ],
    currentDirection: 'into-element',
  };
}
