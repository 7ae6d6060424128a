/**
 * Impedances of sources, lines and transformer banks in per unit of the study's bases, for the
 * property panel. Each on the base of the voltage level it sits on:
 *   - a source: its internal impedance (Ω, or sequence Z1/Z0 in Ω) over Z_base of its own rated
 *     level; given by short-circuit MVA, |Z1| = MVA_base / MVA_sc · (kV_rated / kV_base)², at the
 *     angle of its X/R;
 *   - a line: its series self impedance over its whole length (phase A of per-conductor or matrix
 *     data, Z1 and Z0 of sequence data) over Z_base of its from-bus level;
 *   - a bank: its %R/%X (or %Z at X/R) on its own kVA and HV rating moved to the system base and the
 *     HV level's base kV: Z·(kV_rated/kV_base)²·(MVA_base/MVA_rated).
 * Pure TypeScript (shared).
 */
import { METRES_PER, toCx, type ComplexInput, type Cx } from '../engine/index.ts';
import { baseOfLevel, changeBase, levelKey, type PerUnitSettings } from './per-unit.ts';

/** One impedance in per unit, with what it is and the base it is on. */
export interface PerUnitImpedance {
  label: string;
  pu: Cx;
  /** "on 1 MVA, 0.208 kV". */
  base: string;
}

const isObj = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
const scale = (z: Cx, k: number): Cx => ({ re: z.re * k, im: z.im * k });
const cx = (v: unknown): Cx | null => {
  if (typeof v === 'number' || (isObj(v) && (('re' in v && 'im' in v) || ('mag' in v && 'angleDeg' in v)))) return toCx(v as ComplexInput);
  return null;
};
const baseWords = (s: PerUnitSettings, kv: number) => `on ${s.baseMva} MVA, ${Number(kv.toPrecision(6))} kV`;

/**
 * The element's impedances in per unit, or an empty list (no impedance given, an element kind
 * without one, or no nominal voltage known). `nominalVLL(bus)` gives a bus's nominal line-to-line
 * voltage in V (from the solve), when known.
 */
export function elementImpedancesPu(element: unknown, s: PerUnitSettings, nominalVLL: (bus: string) => number | undefined): PerUnitImpedance[] {
  if (!isObj(element)) return [];
  const out: PerUnitImpedance[] = [];
  if (element.type === 'source' && typeof element.kvLL === 'number' && isObj(element.impedance)) {
    const base = baseOfLevel(s, element.kvLL * 1000);
    const z = element.impedance;
    const add = (label: string, v: unknown) => {
      const c = cx(v);
      if (c) out.push({ label, pu: scale(c, 1 / base.zOhms), base: baseWords(s, base.kvLL) });
    };
    if ('ohms' in z) add('Internal impedance', z.ohms);
    if ('z1' in z) add('Z1 (positive sequence)', z.z1);
    if ('z0' in z) add('Z0 (zero sequence)', z.z0);
    if (typeof z.shortCircuitMva === 'number' && z.shortCircuitMva > 0) {
      const mag = (s.baseMva / z.shortCircuitMva) * (element.kvLL / base.kvLL) ** 2;
      const ang = Math.atan(typeof z.xOverR === 'number' ? z.xOverR : 10);
      out.push({ label: 'Z1 (from the short-circuit MVA)', pu: { re: mag * Math.cos(ang), im: mag * Math.sin(ang) }, base: baseWords(s, base.kvLL) });
    }
  }
  if (element.type === 'line' && typeof element.from === 'string' && typeof element.length === 'number' && isObj(element.impedance)) {
    const vll = nominalVLL(element.from);
    if (vll === undefined) return out;
    const base = baseOfLevel(s, vll);
    const lengthUnit = (typeof element.lengthUnit === 'string' ? element.lengthUnit : 'km') as keyof typeof METRES_PER;
    const perUnit = (typeof element.perLengthUnit === 'string' ? element.perLengthUnit : lengthUnit) as keyof typeof METRES_PER;
    const perLengths = (element.length * (METRES_PER[lengthUnit] ?? 1)) / (METRES_PER[perUnit] ?? 1);
    const imp = element.impedance;
    const add = (label: string, v: unknown) => {
      const c = cx(v);
      if (c) out.push({ label, pu: scale(c, perLengths / base.zOhms), base: baseWords(s, base.kvLL) });
    };
    if (imp.kind === 'perConductor' && isObj(imp.ohmsPerLength)) add('Series Z of phase A, whole length', imp.ohmsPerLength.a);
    if (imp.kind === 'matrix' && Array.isArray(imp.ohmsPerLength) && Array.isArray(imp.ohmsPerLength[0])) add('Series self Z of the first conductor, whole length', imp.ohmsPerLength[0][0]);
    if (imp.kind === 'sequence') {
      add('Z1, whole length', imp.z1PerLength);
      add('Z0, whole length', imp.z0PerLength);
    }
  }
  if (element.type === 'transformer' && typeof element.kva === 'number' && typeof element.kvHigh === 'number') {
    let own: Cx | null = null;
    if (typeof element.percentZ === 'number' && typeof element.xOverR === 'number') {
      const ang = Math.atan(element.xOverR);
      own = { re: (element.percentZ / 100) * Math.cos(ang), im: (element.percentZ / 100) * Math.sin(ang) };
    } else if (typeof element.percentR === 'number' || typeof element.percentX === 'number') {
      own = { re: (Number(element.percentR) || 0) / 100, im: (Number(element.percentX) || 0) / 100 };
    }
    if (own) {
      const base = baseOfLevel(s, element.kvHigh * 1000);
      const k = changeBase(1, { kv: element.kvHigh, mva: element.kva / 1000 }, { kv: base.kvLL, mva: s.baseMva });
      out.push({ label: `Leakage Z (${levelKey(element.kvHigh * 1000)} kV side)`, pu: scale(own, k), base: baseWords(s, base.kvLL) });
    }
  }
  return out;
}
