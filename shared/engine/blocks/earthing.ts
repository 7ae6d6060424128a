/**
 * Star-point earthing and earth electrodes.
 * Expansion: "solid" → a closed switch from the node to earth; { ohms } → an impedance to earth
 * (0 Ω → closed switch); "unearthed" → nothing.
 */
import { EARTH } from '../types.ts';
import type { EarthingInput } from '../schema/common.ts';
import { toCx } from '../schema/to-cx.ts';
import { isZero } from '../phasor.ts';
import type { Expansion, TaggedPrimitive } from './expansion.ts';
import type { Circuit } from '../schema/circuit.ts';

/** Primitives that earth `node` as described by `earthing` (ids `${id}`). */
export function earthingPrimitives(id: string, node: string, earthing: EarthingInput | undefined): TaggedPrimitive[] {
  if (earthing === undefined || earthing === 'unearthed') return [];
  if (earthing === 'solid') return [{ prim: { type: 'switch', id, from: node, to: EARTH, closed: true }, role: 'earth' }];
  const z = toCx(earthing.ohms);
  if (isZero(z)) return [{ prim: { type: 'switch', id, from: node, to: EARTH, closed: true }, role: 'earth' }];
  return [{ prim: { type: 'impedance', id, from: node, to: EARTH, ohms: z }, role: 'earth' }];
}

type EarthingElement = Extract<Circuit['elements'][number], { type: 'earthing' }>;

/** Earth electrode: an impedance (or solid bond) from a node to earth. */
export function expandEarthingElectrode(el: EarthingElement): Expansion {
  return {
    id: el.id,
    type: 'earthing',
    category: 'earthing',
    primitives: earthingPrimitives(`${el.id}/electrode`, el.node, { ohms: el.ohms }),
    ports: [{ conductors: ['node'], nodes: [el.node] }],
    currentDirection: 'into-element',
  };
}
