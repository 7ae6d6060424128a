/**
 * Single-phase centre-tapped transformer for 120/240 V services: one HV winding between two HV
 * conductors and two LV half windings, X1 from `B.1` to `B.n` and X2 from `B.n` to `B.2` (legs in
 * antiphase), stamped as a three-winding unit (./winding-stamp.ts).
 * Leakage split (Kersting, *Distribution System Modeling and Analysis*, centre-tapped transformer
 * model; factors M): with the nameplate R + jX (pu, full winding), Z_HV = 0.5R + j0.8X on the HV
 * base and Z_X1 = Z_X2 = R + j0.4X on the half-winding base; a 240 V test then sees R + jX.
 * The neutral `B.n` is earthed as `lvEarthing` says (default solid).
 */
import { InvalidCircuitError } from '../errors.ts';
import { cx } from '../phasor.ts';
import type { Circuit } from '../schema/circuit.ts';
import { earthingPrimitives } from './earthing.ts';
import { busNode, type Expansion, type TaggedPrimitive } from './expansion.ts';
import { leakagePu } from './transformer.ts';
import { multiWindingY, windingStamp, type Winding } from './winding-stamp.ts';

type SplitTransformer = Extract<Circuit['elements'][number], { type: 'splitPhaseTransformer' }>;

/** Expand a centre-tapped transformer into a three-winding stamp and neutral earthing. */
export function expandSplitPhaseTransformer(el: SplitTransformer): Expansion {
  if (el.primary[0] === el.primary[1]) throw new InvalidCircuitError(`splitPhaseTransformer ${el.id}: the primary needs two different conductors`, [], { elementIds: [el.id] });
  if (el.from === el.to) throw new InvalidCircuitError(`splitPhaseTransformer ${el.id}: "from" and "to" must be different buses`, [], { elementIds: [el.id] });
  const z = leakagePu(el);
  const s = el.kva * 1000;
  const vHv = el.kvHigh * 1000;
  const vHalf = el.lowVolts / 2;
  const zHv = cx(0.5 * z.re * ((vHv * vHv) / s), 0.8 * z.im * ((vHv * vHv) / s));
  const zHalf = cx(z.re * ((vHalf * vHalf) / s), 0.4 * z.im * ((vHalf * vHalf) / s));
  const n = busNode(el.to, 'n');
  const windings: Winding[] = [
    { pos: busNode(el.from, el.primary[0]), neg: busNode(el.from, el.primary[1]) },
    { pos: busNode(el.to, '1'), neg: n },
    { pos: n, neg: busNode(el.to, '2') },
  ];
  const prim = windingStamp(`${el.id}/unit`, windings, multiWindingY([vHv, vHalf, vHalf], [zHv, zHalf, zHalf]));
  const prims: TaggedPrimitive[] = [{ prim, role: 'winding' }, ...earthingPrimitives(`${el.id}/earth-lv`, n, el.lvEarthing ?? 'solid')];
  const lvC = ['1', '2', 'n'];
  return {
    id: el.id,
    type: 'splitPhaseTransformer',
    category: 'series',
    primitives: prims,
    ports: [
      { bus: el.from, conductors: [...el.primary], nodes: el.primary.map((c) => busNode(el.from, c)) },
      { bus: el.to, conductors: lvC, nodes: lvC.map((c) => busNode(el.to, c)) },
    ],
    currentDirection: 'into-element',
    meta: {
      kind: 'transformer',
      windings: [{ primId: prim.id, hvIndex: prim.nodes.indexOf(windings[0].pos), lvIndexes: [prim.nodes.indexOf(windings[1].pos), prim.nodes.indexOf(windings[2].neg)], hvRatedAmps: s / vHv, lvRatedAmps: s / el.lowVolts }],
      lagDeg: 0,
      convention: 'iec',
      vectorGroup: 'centre-tapped',
    },
  };
}
