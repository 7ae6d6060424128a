/**
 * Shunt fault at a bus. Faulted phases connect through the fault impedance `ohms` each to a fault
 * point `<id>#f`; for the earthed kinds that point connects to earth through `earthOhms`.
 * - lineEarth (default phase a): phase → (ohms + earthOhms) → earth;
 * - lineLine (default b, c) and threePhase: phases → ohms → fault point (not earthed);
 * - doubleLineEarth (default b, c) and threePhaseEarth: phases → ohms → fault point → earthOhms → earth.
 * A zero impedance is a closed switch (a bolted fault).
 */
import { EARTH } from '../types.ts';
import type { Cx, Primitive } from '../types.ts';
import { InvalidCircuitError } from '../errors.ts';
import { add, isZero } from '../phasor.ts';
import { toCx } from '../schema/to-cx.ts';
import type { Circuit } from '../schema/circuit.ts';
import { busNode, type Expansion, type TaggedPrimitive } from './expansion.ts';

type FaultElement = Extract<Circuit['elements'][number], { type: 'fault' }>;

const DEFAULT_PHASES: Record<FaultElement['kind'], string[]> = {
  threePhase: ['a', 'b', 'c'],
  threePhaseEarth: ['a', 'b', 'c'],
  lineEarth: ['a'],
  lineLine: ['b', 'c'],
  doubleLineEarth: ['b', 'c'],
};
const COUNT: Record<FaultElement['kind'], number> = { threePhase: 3, threePhaseEarth: 3, lineEarth: 1, lineLine: 2, doubleLineEarth: 2 };

function link(id: string, from: string, to: string, z: Cx): Primitive {
  return isZero(z) ? { type: 'switch', id, from, to, closed: true } : { type: 'impedance', id, from, to, ohms: z };
}

/** Expand a fault into impedances (or closed switches) at the bus. */
export function expandFault(el: FaultElement): Expansion {
  const phases = el.phases ?? DEFAULT_PHASES[el.kind];
  if (phases.length !== COUNT[el.kind] || new Set(phases).size !== phases.length) {
    throw new InvalidCircuitError(`fault ${el.id}: a ${el.kind} fault needs ${COUNT[el.kind]} distinct phase(s)`, [], { elementIds: [el.id] });
  }
  const zf = toCx(el.ohms);
  const zg = toCx(el.earthOhms);
  const point = `${el.id}#f`;
  const prims: TaggedPrimitive[] = [];
  if (el.kind === 'lineEarth') {
    prims.push({ prim: link(`${el.id}/${phases[0]}`, busNode(el.bus, phases[0]), EARTH, add(zf, zg)), phase: phases[0], role: 'earth' });
  } else {
    for (const p of phases) prims.push({ prim: link(`${el.id}/${p}`, busNode(el.bus, p), point, zf), phase: p });
    if (el.kind === 'threePhaseEarth' || el.kind === 'doubleLineEarth') prims.push({ prim: link(`${el.id}/earth`, point, EARTH, zg), role: 'earth' });
  }
  return {
    id: el.id,
    type: 'fault',
    category: 'fault',
    primitives: prims,
    ports: [{ bus: el.bus, conductors: ['a', 'b', 'c'], nodes: ['a', 'b', 'c'].map((c) => busNode(el.bus, c)) }],
    currentDirection: 'into-element',
    meta: { kind: 'fault', faultKind: el.kind, bus: el.bus, phases },
  };
}
