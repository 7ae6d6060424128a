/**
 * Loads: wye with the star point on the bus neutral (`wye`) or floating (`wyeFloating`, internal
 * node `<id>#star`), delta (branches ab, bc, ca), or single-phase `between` any two conductors.
 * Each branch becomes one primitive `<id>/<branch>`:
 * - `{ohms}` → impedance; `{rOhms, lHenry, cFarad}` → impedance at the study frequency
 *   (series: Z = R + jωL + 1/(jωC); parallel: 1/Z = 1/R + 1/(jωL) + jωC);
 * - `{kw, kvar, model}` (per branch; `total` is split equally) → at rated voltage V the branch
 *   draws S = P + jQ: model "impedance" → impedance Z = V²/S*; "current", "power" or a ZIP mix →
 *   a zipLoad primitive solved iteratively by the solver.
 * Rated branch voltage: wye V_LN, delta V_LL (from `kvLL` or the bus nominal), single-phase
 * `ratedVolts` or the nominal voltage between its two conductors.
 */
import type { Cx } from '../types.ts';
import { InvalidCircuitError } from '../errors.ts';
import { add, conj, cx, div, inv, isZero, scale } from '../phasor.ts';
import { toCx } from '../schema/to-cx.ts';
import type { Circuit } from '../schema/circuit.ts';
import type { LoadSpec } from '../schema/blocks.ts';
import { busNode, type BusNominal, type ExpandContext, type Expansion, type TaggedPrimitive } from './expansion.ts';

type LoadElement = Extract<Circuit['elements'][number], { type: 'load' }>;

function fail(id: string, msg: string): never {
  throw new InvalidCircuitError(`load ${id}: ${msg}`, [], { elementIds: [id] });
}

/** Impedance (ohms) of an R/L/C spec at `frequencyHz`; throws on a zero or empty spec. */
export function rlcOhms(id: string, spec: { rOhms?: number; lHenry?: number; cFarad?: number; arrangement: 'series' | 'parallel' }, frequencyHz: number): Cx {
  const w = 2 * Math.PI * frequencyHz;
  const { rOhms, lHenry, cFarad } = spec;
  if (rOhms === undefined && lHenry === undefined && cFarad === undefined) fail(id, 'give at least one of rOhms, lHenry, cFarad');
  if (spec.arrangement === 'series') {
    let z = cx(rOhms ?? 0, w * (lHenry ?? 0));
    if (cFarad !== undefined) z = add(z, cx(0, -1 / (w * cFarad)));
    if (isZero(z)) fail(id, 'zero impedance (a short circuit): use a fault or a switch for that');
    return z;
  }
  if (rOhms === 0 || lHenry === 0) fail(id, 'a parallel branch of zero ohms or zero henry is a short circuit');
  let y = cx(0, 0);
  if (rOhms !== undefined) y = add(y, cx(1 / rOhms));
  if (lHenry !== undefined) y = add(y, cx(0, -1 / (w * lHenry)));
  if (cFarad !== undefined) y = add(y, cx(0, w * cFarad));
  if (isZero(y)) fail(id, 'the parallel branches cancel (infinite impedance at this frequency)');
  return inv(y);
}

/** One primitive for a load branch between `from` and `to` with rated voltage `ratedVolts`. */
export function loadBranch(id: string, primId: string, from: string, to: string, spec: LoadSpec, ratedVolts: number | undefined, frequencyHz: number, shareOfTotal = 1): TaggedPrimitive['prim'] {
  if ('ohms' in spec) {
    const z = toCx(spec.ohms);
    if (isZero(z)) fail(id, 'zero impedance (a short circuit): use a fault or a switch for that');
    return { type: 'impedance', id: primId, from, to, ohms: z };
  }
  if (!('kw' in spec)) return { type: 'impedance', id: primId, from, to, ohms: rlcOhms(id, spec, frequencyHz) };
  const s = scale(cx(spec.kw * 1000, spec.kvar * 1000), shareOfTotal);
  if (isZero(s)) fail(id, 'kW and kvar are both zero (the load draws nothing: remove it)');
  if (ratedVolts === undefined) fail(id, 'kW/kvar need a rated voltage: give "kvLL" (or "ratedVolts"), or the bus nominal voltage');
  const zip = spec.model === 'impedance' ? { z: 1, i: 0, p: 0 } : spec.model === 'current' ? { z: 0, i: 1, p: 0 } : spec.model === 'power' ? { z: 0, i: 0, p: 1 } : spec.model;
  if (Math.abs(zip.z + zip.i + zip.p - 1) > 1e-9) fail(id, `the ZIP fractions must sum to 1 (they sum to ${zip.z + zip.i + zip.p})`);
  if (zip.z === 1) return { type: 'impedance', id: primId, from, to, ohms: div(cx(ratedVolts * ratedVolts), conj(s)) };
  return { type: 'zipLoad', id: primId, from, to, ratedVolts, ratedVA: s, zip };
}

const PHASE_SET = new Set(['a', 'b', 'c']);
const SPLIT_LEGS = new Set(['1', '2']);

/** Nominal voltage between two conductors of a bus (V), if known. */
export function nominalBetween(nom: BusNominal | undefined, c1: string, c2: string): number | undefined {
  if (!nom) return undefined;
  const isN = (c: string) => c === 'n';
  if (isN(c1) || isN(c2)) return nom.vLN;
  if ((PHASE_SET.has(c1) && PHASE_SET.has(c2)) || (SPLIT_LEGS.has(c1) && SPLIT_LEGS.has(c2))) return nom.vLL;
  return undefined;
}

/** Expand a load into one primitive per branch. */
export function expandLoad(el: LoadElement, ctx: ExpandContext): Expansion {
  const nomBus = ctx.nominal.get(el.bus);
  // a load's own kvLL: line to line (split-phase bus: leg to leg, so leg to neutral is half of it)
  const split = ctx.splitPhase.has(el.bus);
  const nom: BusNominal | undefined = el.kvLL !== undefined ? { vLL: el.kvLL * 1000, vLN: (el.kvLL * 1000) / (split ? 2 : Math.sqrt(3)) } : nomBus;
  const ratedFrom: 'load' | 'bus' | undefined = el.kvLL !== undefined ? 'load' : nomBus ? 'bus' : undefined;
  let branches: { key: string; from: string; to: string; fromC: string; toC: string; rated?: number; ratedFrom?: 'load' | 'bus' }[];
  const star = el.connection === 'wyeFloating' ? `${el.id}#star` : busNode(el.bus, 'n');
  if (el.connection === 'wye' || el.connection === 'wyeFloating') {
    const toC = el.connection === 'wye' ? 'n' : 'star';
    branches = ['a', 'b', 'c'].map((p) => ({ key: p, from: busNode(el.bus, p), to: star, fromC: p, toC, rated: nom?.vLN, ratedFrom }));
  } else if (el.connection === 'delta') {
    branches = [['a', 'b'], ['b', 'c'], ['c', 'a']].map(([p, q]) => ({ key: p + q, from: busNode(el.bus, p), to: busNode(el.bus, q), fromC: p, toC: q, rated: nom?.vLL, ratedFrom }));
  } else {
    const [c1, c2] = el.between!;
    if (c1 === c2) fail(el.id, '"between" needs two different conductors');
    const rated = el.ratedVolts ?? nominalBetween(nom, c1, c2);
    const from1: 'load' | 'bus' | undefined = el.ratedVolts !== undefined ? 'load' : rated === undefined ? undefined : ratedFrom;
    branches = [{ key: `${c1}${c2}`, from: busNode(el.bus, c1), to: busNode(el.bus, c2), fromC: c1, toC: c2, rated, ratedFrom: from1 }];
  }
  if (el.phases) {
    const keys = new Set(branches.map((b) => b.key));
    for (const k of Object.keys(el.phases)) if (!keys.has(k)) fail(el.id, `phase "${k}" does not exist on a ${el.connection} load (use ${[...keys].join(', ')})`);
    if (el.connection === 'single') fail(el.id, 'a single-phase load takes "each" (or "total"), not "phases"');
    branches = branches.filter((b) => el.phases![b.key as keyof typeof el.phases] !== undefined);
  }
  if (el.total && !('kw' in el.total)) fail(el.id, '"total" takes kW and kvar; give impedances with "each" or "phases"');
  const prims: TaggedPrimitive[] = branches.map((b) => {
    const spec = (el.each ?? el.total ?? el.phases![b.key as keyof typeof el.phases])!;
    return { prim: loadBranch(el.id, `${el.id}/${b.key}`, b.from, b.to, spec, b.rated, ctx.frequencyHz, el.total ? 1 / branches.length : 1), phase: b.key };
  });
  const conductors = el.connection === 'single' ? [...el.between!] : el.connection === 'wye' ? ['a', 'b', 'c', 'n'] : ['a', 'b', 'c'];
  return {
    id: el.id,
    type: 'load',
    category: 'load',
    primitives: prims,
    ports: [{ bus: el.bus, conductors, nodes: conductors.map((c) => busNode(el.bus, c)) }],
    currentDirection: 'into-element',
    meta: {
      kind: 'load',
      bus: el.bus,
      connection: el.connection,
      branches: branches.map((b) => ({
        key: b.key,
        fromConductor: b.fromC,
        toConductor: b.toC,
        fromNode: b.from,
        toNode: b.to,
        ...(b.rated !== undefined ? { ratedVolts: b.rated, ...(b.ratedFrom ? { ratedFrom: b.ratedFrom } : {}) } : {}),
      })),
    },
  };
}
