/**
 * Test-side Carson line data, written independently of shared/engine/blocks/carson.ts from the
 * published equations (V): W. H. Kersting, *Distribution System Modeling and Analysis*, ch. 4,
 * the modified Carson equations in Ω/mile. They come from Carson's equations with the first terms
 * of the earth-correction series, P = π/8 and Q = −0.0386 + ½·ln(2/k):
 *   r_earth = 4ωP·G = π²·f·G                       (Kersting: 0.00158836·f)
 *   x       = 2ωG·[ln(1/GMR or 1/D) + 7.6786 + ½·ln(ρ/f)]   (Kersting: 0.00202237·f)
 * with G = 0.1609344e-3 Ω/mile and the constant 7.6786 as printed. The printed rounded
 * coefficients are used (they are the published equations; π²·f·G differs in the 7th digit).
 * Kron reduction is not computed here: the SPICE netlist keeps the neutral conductor and earths
 * it at both ends, which is the physical assumption Kron reduction encodes.
 */
import type { Cx } from '../../../../shared/engine/types.ts';

/** One conductor of an overhead line: position and GMR in feet, resistance in Ω/mile. */
export interface CarsonWire {
  conductor: string;
  xFt: number;
  yFt: number;
  gmrFt: number;
  rOhmsPerMile: number;
}

/** (V) Kersting ch. 4: modified Carson equations, coefficients as printed. */
const R_EARTH_PER_HZ = 0.00158836; // Ω/mile/Hz
const X_PER_HZ = 0.00202237; // Ω/mile/Hz
const CONSTANT = 7.6786;

/** Primitive (unreduced) series impedance matrix in Ω/mile. */
export function carsonMatrixOhmsPerMile(wires: CarsonWire[], f: number, rhoOhmM: number): Cx[][] {
  const n = wires.length;
  const out: Cx[][] = [];
  const tail = CONSTANT + 0.5 * Math.log(rhoOhmM / f);
  for (let i = 0; i < n; i++) {
    const row: Cx[] = [];
    for (let j = 0; j < n; j++) {
      const dist = i === j ? wires[i].gmrFt : Math.sqrt((wires[i].xFt - wires[j].xFt) ** 2 + (wires[i].yFt - wires[j].yFt) ** 2);
      row.push({ re: (i === j ? wires[i].rOhmsPerMile : 0) + R_EARTH_PER_HZ * f, im: X_PER_HZ * f * (tail - Math.log(dist)) });
    }
    out.push(row);
  }
  return out;
}

/** Length of one unit in miles (international mile = 1.609344 km exactly). */
export const MILES: Record<'km' | 'm' | 'mi' | 'ft', number> = { km: 1 / 1.609344, m: 1 / 1609.344, mi: 1, ft: 1 / 5280 };
