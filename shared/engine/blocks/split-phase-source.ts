/**
 * 120/240 V split-phase (centre-tapped) source: EMF V∠θ from `B.n` to `B.1` and V∠θ+180° from
 * `B.n` to `B.2` (legs in antiphase, 2V leg to leg), each behind `ohms`; neutral earthed (default solid).
 */
import type { Circuit } from '../schema/circuit.ts';
import { polar } from '../phasor.ts';
import { toCx } from '../schema/to-cx.ts';
import { earthingPrimitives } from './earthing.ts';
import { busNode, type Expansion, type TaggedPrimitive } from './expansion.ts';

type SplitSource = Extract<Circuit['elements'][number], { type: 'splitPhaseSource' }>;

/** Expand a split-phase source into two leg EMFs and neutral earthing. */
export function expandSplitPhaseSource(el: SplitSource): Expansion {
  const n = busNode(el.bus, 'n');
  const series = el.ohms === undefined ? {} : { seriesOhms: toCx(el.ohms) };
  const prims: TaggedPrimitive[] = (['1', '2'] as const).map((leg, k) => ({
    prim: { type: 'voltageSource', id: `${el.id}/emf-${leg}`, plus: busNode(el.bus, leg), minus: n, volts: polar(el.voltsLN, el.angleDeg + 180 * k), ...series },
    phase: leg,
    role: 'emf',
  }));
  prims.push(...earthingPrimitives(`${el.id}/earth`, n, el.earthing ?? 'solid'));
  const conductors = ['1', '2', 'n'];
  return {
    id: el.id,
    type: 'splitPhaseSource',
    category: 'source',
    primitives: prims,
    ports: [{ bus: el.bus, conductors, nodes: conductors.map((c) => busNode(el.bus, c)) }],
    currentDirection: 'out-of-element',
  };
}
