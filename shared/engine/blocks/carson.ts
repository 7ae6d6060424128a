/**
 * Series impedance of overhead conductors from their data and spacing by the modified Carson
 * equations, with optional Kron reduction of an earthed neutral.
 * Source: W. H. Kersting, *Distribution System Modeling and Analysis*, ch. 4 (constants as given there):
 *   z_ii = r_i + 0.00158836·f + j0.00202237·f·[ln(1/GMR_i) + 7.6786 + ½·ln(ρ/f)]   Ω/mile
 *   z_ij =       0.00158836·f + j0.00202237·f·[ln(1/D_ij)  + 7.6786 + ½·ln(ρ/f)]   Ω/mile
 * with GMR and D in feet, ρ in Ω·m, f in Hz. Kron: z_abc = z_ij − z_in·z_nn⁻¹·z_nj.
 */
import type { Cx } from '../types.ts';
import { div, mul, sub } from '../phasor.ts';

/** One conductor: position (ft), geometric mean radius (ft) and resistance (Ω/mile). */
export interface CarsonConductor {
  conductor: string;
  xFt: number;
  yFt: number;
  gmrFt: number;
  rOhmsPerMile: number;
}

/** Primitive impedance matrix (Ω/mile) of the conductors by the modified Carson equations. */
export function carsonPrimitiveMatrix(conductors: CarsonConductor[], frequencyHz: number, earthResistivityOhmM: number): Cx[][] {
  const f = frequencyHz;
  const rEarth = 0.00158836 * f;
  const k = 0.00202237 * f;
  const c = 7.6786 + 0.5 * Math.log(earthResistivityOhmM / f);
  return conductors.map((ci, i) =>
    conductors.map((cj, j) => {
      if (i === j) return { re: ci.rOhmsPerMile + rEarth, im: k * (Math.log(1 / ci.gmrFt) + c) };
      const d = Math.hypot(ci.xFt - cj.xFt, ci.yFt - cj.yFt);
      return { re: rEarth, im: k * (Math.log(1 / d) + c) };
    }),
  );
}

/** Kron reduction eliminating conductor index `k` (its voltage drop is zero: earthed at both ends). */
export function kronReduce(z: Cx[][], k: number): Cx[][] {
  const keep = z.map((_, i) => i).filter((i) => i !== k);
  return keep.map((i) => keep.map((j) => sub(z[i][j], div(mul(z[i][k], z[k][j]), z[k][k]))));
}
