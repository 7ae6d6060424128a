/**
 * Capacitor bank: `kvar` (three-phase) at rated voltage, wye (star on `B.n`), floating wye or
 * delta. Each branch is an impedance Z = −j·V²/Q_branch with Q_branch = kvar/3 and V the branch's
 * rated voltage (wye V_LN, delta V_LL).
 */
import { InvalidCircuitError } from '../errors.ts';
import { cx } from '../phasor.ts';
import type { Circuit } from '../schema/circuit.ts';
import { busNode, type ExpandContext, type Expansion, type TaggedPrimitive } from './expansion.ts';

type CapBank = Extract<Circuit['elements'][number], { type: 'capacitorBank' }>;

/** Expand a capacitor bank into three capacitive impedances. */
export function expandCapacitorBank(el: CapBank, ctx: ExpandContext): Expansion {
  const vLL = el.kvLL !== undefined ? el.kvLL * 1000 : ctx.nominal.get(el.bus)?.vLL;
  if (vLL === undefined) throw new InvalidCircuitError(`capacitorBank ${el.id}: give "kvLL" (the bus has no known nominal voltage)`, [], { elementIds: [el.id] });
  const delta = el.connection === 'delta';
  const v = delta ? vLL : vLL / Math.sqrt(3);
  const x = (v * v) / ((el.kvar * 1000) / 3);
  const star = el.connection === 'wyeFloating' ? `${el.id}#star` : busNode(el.bus, 'n');
  const pairs: [string, string, string][] = delta
    ? [['ab', 'a', 'b'], ['bc', 'b', 'c'], ['ca', 'c', 'a']]
    : [['a', 'a', ''], ['b', 'b', ''], ['c', 'c', '']];
  const prims: TaggedPrimitive[] = pairs.map(([key, p, q]) => ({
    prim: { type: 'impedance', id: `${el.id}/${key}`, from: busNode(el.bus, p), to: q ? busNode(el.bus, q) : star, ohms: cx(0, -x) },
    phase: key,
  }));
  const conductors = el.connection === 'wye' ? ['a', 'b', 'c', 'n'] : ['a', 'b', 'c'];
  return {
    id: el.id,
    type: 'capacitorBank',
    category: 'load',
    primitives: prims,
    ports: [{ bus: el.bus, conductors, nodes: conductors.map((c) => busNode(el.bus, c)) }],
    currentDirection: 'into-element',
  };
}
