/**
 * Three-phase transformer bank: three single-phase two-winding units.
 *
 * Each unit k has its HV winding on the HV terminals and its LV winding on the LV terminals chosen
 * by the vector group; its stamp is ./winding-stamp.ts with turns ratio n = V_HV,winding / V_LV,winding
 * (wye winding: kV_LL/√3, delta winding: kV_LL) and leakage z = (%R + j%X)/100 · V_LV,winding² / (S/3)
 * referred to the LV winding.
 *
 * Tap (`tap: { steps, stepPercent }`, default 0): an off-load tap on the HV winding. The HV winding
 * has (1 + steps·stepPercent/100) times its rated turns, so the ratio is n·(1 + tap%/100) and the
 * LV voltage for a given HV voltage falls by that factor on a positive tap ((P) common practice:
 * the tap changes the turns ratio; the leakage impedance stays as rated, referred to the LV
 * winding, and rated winding currents stay at the rated tap).
 *
 * Vector group: IEC 60076-1 clock notation `vectorGroup` ("Dyn11", "YNyn0", "Yd1", "Dd0", …: the LV
 * phasors lag the HV ones by clock × 30° for an ABC system), or the North American `connection`
 * ("D-Yg", "Yg-Yg", …) where the low side lags the high side by 30° for D–Y and Y–D (= IEC clock 1)
 * and 0° otherwise (IEEE C57.12.00 angular displacement). The windings are physically wired, so an
 * ACB system sees the opposite displacement.
 * Wye windings: "YN"/"yn"/"Yg" put the star point on the bus neutral `B.n`, earthed as
 * `hvEarthing`/`lvEarthing` say (default solid); "Y"/"y" keep an internal star point
 * (`<id>#hvStar`/`<id>#lvStar`), unearthed unless told. Delta windings have no earth path of their
 * own, so zero-sequence current does not pass a bank with a delta winding.
 */
import type { Cx } from '../types.ts';
import { InvalidCircuitError } from '../errors.ts';
import { abs, angleDeg, cx, polar, scale, sub } from '../phasor.ts';
import type { Circuit } from '../schema/circuit.ts';
import type { EarthingInput } from '../schema/common.ts';
import { earthingPrimitives } from './earthing.ts';
import { busNode, type Expansion, type TaggedPrimitive, type TransformerMeta } from './expansion.ts';
import { twoWindingY, windingStamp, type Winding } from './winding-stamp.ts';

type TransformerElement = Extract<Circuit['elements'][number], { type: 'transformer' }>;
const PH = ['a', 'b', 'c'] as const;

/** Parsed winding arrangement of a bank. */
export interface BankArrangement {
  hv: 'wye' | 'delta';
  lv: 'wye' | 'delta';
  hvNeutralOut: boolean;
  lvNeutralOut: boolean;
  /** IEC clock number (LV lags HV by clock × 30°). */
  clock: number;
  convention: 'iec' | 'northAmerican';
  label: string;
}

/** Read `vectorGroup` or `connection` into an arrangement. */
export function bankArrangement(el: Pick<TransformerElement, 'vectorGroup' | 'connection' | 'id'>): BankArrangement {
  if (el.vectorGroup) {
    const m = /^(YN|Y|D)(yn|y|d)(\d{1,2})$/.exec(el.vectorGroup)!;
    const hv = m[1] === 'D' ? 'delta' : 'wye';
    const lv = m[2] === 'd' ? 'delta' : 'wye';
    const clock = Number(m[3]);
    const odd = clock % 2 === 1;
    if (odd !== (hv !== lv)) {
      throw new InvalidCircuitError(`transformer ${el.id}: vector group ${el.vectorGroup} is not realisable (odd clock numbers need one delta and one wye winding, even ones two alike)`, [], { elementIds: [el.id] });
    }
    return { hv, lv, hvNeutralOut: m[1] === 'YN', lvNeutralOut: m[2] === 'yn', clock, convention: 'iec', label: el.vectorGroup };
  }
  const [h, l] = el.connection!.split('-');
  const hv = h === 'D' ? 'delta' : 'wye';
  const lv = l === 'D' ? 'delta' : 'wye';
  return { hv, lv, hvNeutralOut: h === 'Yg', lvNeutralOut: l === 'Yg', clock: hv !== lv ? 1 : 0, convention: 'northAmerican', label: el.connection! };
}

const unit = (k: number): Cx => polar(1, -120 * k);
const sameAngle = (a: number, b: number) => Math.abs(((((a - b) % 360) + 540) % 360) - 180) < 1e-6;

/** For each LV winding k, the HV winding parallel to it (terminal indexes; 3 = star point). */
export function pairWindings(arr: BankArrangement): { hv: [number, number]; lv: [number, number] }[] {
  // HV candidates with their phasor under a balanced ABC set with Va at 0°.
  const hvCandidates: { nodes: [number, number]; v: Cx }[] = [];
  for (let j = 0; j < 3; j++) {
    if (arr.hv === 'wye') {
      hvCandidates.push({ nodes: [j, 3], v: unit(j) }, { nodes: [3, j], v: scale(unit(j), -1) });
    } else {
      for (let m = 0; m < 3; m++) if (m !== j) hvCandidates.push({ nodes: [j, m], v: sub(unit(j), unit(m)) });
    }
  }
  // The LV set the vector group asks for: Va lags by clock × 30°.
  const lvPh = (k: number) => polar(1, -30 * arr.clock - 120 * k);
  return [0, 1, 2].map((k) => {
    const lv: [number, number] = arr.lv === 'wye' ? [k, 3] : [k, (k + 1) % 3];
    const vLv = arr.lv === 'wye' ? lvPh(k) : sub(lvPh(k), lvPh((k + 1) % 3));
    const match = hvCandidates.find((c) => sameAngle(angleDeg(c.v), angleDeg(vLv)));
    if (!match) throw new Error(`internal: no HV winding for clock ${arr.clock}`);
    return { hv: match.nodes, lv };
  });
}

/** Leakage impedance in per unit from %R/%X or %Z with X/R. */
export function leakagePu(el: { percentR?: number; percentX?: number; percentZ?: number; xOverR?: number; id: string }): Cx {
  if (el.percentZ !== undefined && el.xOverR !== undefined) {
    const r = el.percentZ / Math.sqrt(1 + el.xOverR * el.xOverR);
    return cx(r / 100, (r * el.xOverR) / 100);
  }
  const z = cx((el.percentR ?? 0) / 100, (el.percentX ?? 0) / 100);
  if (abs(z) === 0) throw new InvalidCircuitError(`transformer ${el.id}: the leakage impedance must be non-zero (give a few % of X)`, [], { elementIds: [el.id] });
  return z;
}

/** The ratio multiplier of the HV tap, 1 + steps·stepPercent/100 (1 with no tap). */
export function tapFactor(el: Pick<TransformerElement, 'tap'>): number {
  return el.tap ? 1 + (el.tap.steps * el.tap.stepPercent) / 100 : 1;
}

/** Expand a three-phase bank into three unit stamps plus star-point earthing. */
export function expandTransformer(el: TransformerElement): Expansion {
  if (el.from === el.to) throw new InvalidCircuitError(`transformer ${el.id}: "from" and "to" must be different buses`, [], { elementIds: [el.id] });
  if (el.kvHigh < el.kvLow) throw new InvalidCircuitError(`transformer ${el.id}: kvHigh (${el.kvHigh} kV) is below kvLow (${el.kvLow} kV); "from" is the high-voltage side (the phase shift is stated HV to LV)`, [], { elementIds: [el.id] });
  const arr = bankArrangement(el);
  const vHvW = arr.hv === 'wye' ? (el.kvHigh * 1000) / Math.sqrt(3) : el.kvHigh * 1000;
  const vLvW = arr.lv === 'wye' ? (el.kvLow * 1000) / Math.sqrt(3) : el.kvLow * 1000;
  const sUnit = (el.kva * 1000) / 3;
  const zLv = scale(leakagePu(el), (vLvW * vLvW) / sUnit);
  const yw = twoWindingY(zLv, (vHvW / vLvW) * tapFactor(el));
  const hvStar = arr.hvNeutralOut ? busNode(el.from, 'n') : `${el.id}#hvStar`;
  const lvStar = arr.lvNeutralOut ? busNode(el.to, 'n') : `${el.id}#lvStar`;
  const hvNode = (i: number) => (i === 3 ? hvStar : busNode(el.from, PH[i]));
  const lvNode = (i: number) => (i === 3 ? lvStar : busNode(el.to, PH[i]));
  const prims: TaggedPrimitive[] = [];
  const windings: TransformerMeta['windings'] = [];
  pairWindings(arr).forEach((pair, k) => {
    const w: Winding[] = [
      { pos: hvNode(pair.hv[0]), neg: hvNode(pair.hv[1]) },
      { pos: lvNode(pair.lv[0]), neg: lvNode(pair.lv[1]) },
    ];
    const prim = windingStamp(`${el.id}/unit-${PH[k]}`, w, yw);
    prims.push({ prim, phase: PH[k], role: 'winding' });
    windings.push({ primId: prim.id, hvIndex: prim.nodes.indexOf(w[0].pos), lvIndexes: [prim.nodes.indexOf(w[1].pos)], hvRatedAmps: sUnit / vHvW, lvRatedAmps: sUnit / vLvW });
  });
  const earthing = (e: EarthingInput | undefined, out: boolean): EarthingInput => e ?? (out ? 'solid' : 'unearthed');
  if (arr.hv === 'wye') prims.push(...earthingPrimitives(`${el.id}/earth-hv`, hvStar, earthing(el.hvEarthing, arr.hvNeutralOut)));
  else if (el.hvEarthing !== undefined) throw new InvalidCircuitError(`transformer ${el.id}: a delta HV winding has no star point to earth`, [], { elementIds: [el.id] });
  if (arr.lv === 'wye') prims.push(...earthingPrimitives(`${el.id}/earth-lv`, lvStar, earthing(el.lvEarthing, arr.lvNeutralOut)));
  else if (el.lvEarthing !== undefined) throw new InvalidCircuitError(`transformer ${el.id}: a delta LV winding has no star point to earth`, [], { elementIds: [el.id] });
  const hvC = arr.hvNeutralOut ? ['a', 'b', 'c', 'n'] : ['a', 'b', 'c'];
  const lvC = arr.lvNeutralOut ? ['a', 'b', 'c', 'n'] : ['a', 'b', 'c'];
  return {
    id: el.id,
    type: 'transformer',
    category: 'series',
    primitives: prims,
    ports: [
      { bus: el.from, conductors: hvC, nodes: hvC.map((c) => busNode(el.from, c)) },
      { bus: el.to, conductors: lvC, nodes: lvC.map((c) => busNode(el.to, c)) },
    ],
    currentDirection: 'into-element',
    meta: { kind: 'transformer', windings, lagDeg: 30 * arr.clock, convention: arr.convention, vectorGroup: arr.label, ...(el.tap ? { tapPercent: el.tap.steps * el.tap.stepPercent } : {}) },
  };
}
