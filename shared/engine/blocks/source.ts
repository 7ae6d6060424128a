/**
 * Three-phase source.
 *
 * Wye: one ideal EMF per phase from the star point (the bus neutral node `B.n`) to the phase,
 * behind the internal impedance; the star point is earthed as `earthing` says (default solid).
 * Internal impedance: `{ohms}` per phase → the EMFs' series impedance; `{z1, z0}` or short-circuit
 * MVA with X/R → a coupled 3×3 branch with Zs = (Z0 + 2Z1)/3 on the diagonal and Zm = (Z0 − Z1)/3
 * off it (Z2 = Z1; standard symmetrical-component transformation), so an earth fault sees Z0.
 *
 * Delta: modelled by its equivalent wye EMFs Va = (Vab − Vca)/3 … with an internal, unearthed star
 * point (`<id>#star`); the line voltages at the terminals are exactly the delta EMFs, the per-phase
 * impedance is that of the equivalent wye, and the delta EMFs must sum to zero (an ideal delta
 * loop with a net EMF has no solution). Winding currents inside the delta are not reported.
 */
import type { Cx } from '../types.ts';
import { InvalidCircuitError } from '../errors.ts';
import { abs, add, cx, div, isZero, polar, scale, sub } from '../phasor.ts';
import { toCx } from '../schema/to-cx.ts';
import type { Circuit } from '../schema/circuit.ts';
import { earthingPrimitives } from './earthing.ts';
import { busNode, phaseOffsetsDeg, type ExpandContext, type Expansion, type TaggedPrimitive } from './expansion.ts';

type SourceElement = Extract<Circuit['elements'][number], { type: 'source' }>;
const PH = ['a', 'b', 'c'] as const;

/** Series impedance of a source as a 3×3 phase matrix (ohms), or a per-phase scalar, or null if ideal. */
export function sourceImpedance(el: SourceElement): { scalar: Cx } | { matrix: Cx[][] } | null {
  const imp = el.impedance;
  if (!imp) return null;
  let z1: Cx;
  let z0: Cx;
  if ('ohms' in imp) return isZero(toCx(imp.ohms)) ? null : { scalar: toCx(imp.ohms) };
  if ('z1' in imp) {
    z1 = toCx(imp.z1);
    z0 = imp.z0 === undefined ? z1 : toCx(imp.z0);
  } else {
    // |Z1| = kV² / MVA; angle from X/R (short-circuit level at the source terminals).
    const zMag = (el.kvLL * el.kvLL) / imp.shortCircuitMva;
    const r = zMag / Math.sqrt(1 + imp.xOverR * imp.xOverR);
    z1 = cx(r, r * imp.xOverR);
    z0 = scale(z1, imp.z0OverZ1 ?? 1);
  }
  if (isZero(z1) || isZero(z0)) throw new InvalidCircuitError(`source ${el.id}: sequence impedances must be non-zero (omit "impedance" for an ideal source)`, [], { elementIds: [el.id] });
  if (abs(sub(z0, z1)) <= 1e-12 * abs(z1)) return { scalar: z1 };
  const zs = scale(add(z0, scale(z1, 2)), 1 / 3);
  const zm = scale(sub(z0, z1), 1 / 3);
  return { matrix: PH.map((_, i) => PH.map((_, j) => (i === j ? zs : zm))) };
}

/** EMFs of the equivalent wye (V, RMS phasors) for phases a, b, c. */
export function sourceEmfs(el: SourceElement, sequence: 'ABC' | 'ACB'): Cx[] {
  const vln = (el.kvLL * 1000) / Math.sqrt(3);
  const off = phaseOffsetsDeg(sequence);
  const balanced = PH.map((_, k) => polar(vln, el.angleDeg + off[k]));
  const ov = el.phases ?? {};
  if (el.connection === 'wye') {
    if (ov.ab || ov.bc || ov.ca) throw new InvalidCircuitError(`source ${el.id}: a wye source takes overrides for phases a, b, c (not ab, bc, ca)`, [], { elementIds: [el.id] });
    return PH.map((p, k) => {
      const o = ov[p];
      if (!o) return balanced[k];
      return polar(o.pu !== undefined ? o.pu * vln : vln, o.angleDeg ?? el.angleDeg + off[k]);
    });
  }
  if (ov.a || ov.b || ov.c) throw new InvalidCircuitError(`source ${el.id}: a delta source takes overrides for ab, bc, ca (not a, b, c)`, [], { elementIds: [el.id] });
  const lineKeys = ['ab', 'bc', 'ca'] as const;
  const lines = lineKeys.map((key, k) => {
    const v = sub(balanced[k], balanced[(k + 1) % 3]);
    const o = ov[key];
    if (!o) return v;
    const vll = el.kvLL * 1000;
    return polar(o.pu !== undefined ? o.pu * vll : abs(v), o.angleDeg ?? (Math.atan2(v.im, v.re) * 180) / Math.PI);
  });
  const net = add(add(lines[0], lines[1]), lines[2]);
  if (abs(net) > 1e-9 * el.kvLL * 1000) {
    throw new InvalidCircuitError(`source ${el.id}: the delta EMFs Vab + Vbc + Vca must sum to zero (they sum to ${abs(net).toPrecision(4)} V)`, [], { elementIds: [el.id] });
  }
  // Equivalent wye: Va = (Vab − Vca)/3, Vb = (Vbc − Vab)/3, Vc = (Vca − Vbc)/3.
  return [div(sub(lines[0], lines[2]), cx(3)), div(sub(lines[1], lines[0]), cx(3)), div(sub(lines[2], lines[1]), cx(3))];
}

/** Expand a three-phase source into EMFs, internal impedance and star-point earthing. */
export function expandSource(el: SourceElement, ctx: ExpandContext): Expansion {
  const emfs = sourceEmfs(el, ctx.sequence);
  const z = sourceImpedance(el);
  const wye = el.connection === 'wye';
  if (!wye && el.earthing !== undefined) throw new InvalidCircuitError(`source ${el.id}: a delta source has no star point to earth`, [], { elementIds: [el.id] });
  const star = wye ? busNode(el.bus, 'n') : `${el.id}#star`;
  const prims: TaggedPrimitive[] = [];
  const internal = z && 'matrix' in z;
  PH.forEach((p, k) => {
    const plus = internal ? `${el.id}#${p}` : busNode(el.bus, p);
    prims.push({
      prim: { type: 'voltageSource', id: `${el.id}/emf-${p}`, plus, minus: star, volts: emfs[k], ...(z && 'scalar' in z ? { seriesOhms: z.scalar } : {}) },
      phase: p,
      role: 'emf',
    });
  });
  if (z && 'matrix' in z) {
    prims.push({
      prim: { type: 'coupledBranch', id: `${el.id}/internal`, from: PH.map((p) => `${el.id}#${p}`), to: PH.map((p) => busNode(el.bus, p)), ohms: z.matrix },
    });
  }
  if (wye) prims.push(...earthingPrimitives(`${el.id}/earth`, star, el.earthing ?? 'solid'));
  const conductors = wye ? ['a', 'b', 'c', 'n'] : ['a', 'b', 'c'];
  return {
    id: el.id,
    type: 'source',
    category: 'source',
    primitives: prims,
    ports: [{ bus: el.bus, conductors, nodes: conductors.map((c) => busNode(el.bus, c)) }],
    currentDirection: 'out-of-element',
  };
}
