/**
 * Nodal admittance stamps of single-phase transformer units.
 *
 * Two windings (leakage z referred to winding 2, turns ratio n = N1/N2): on the winding voltages
 * (v1, v2) the admittance is [[y/n², −y/n], [−y/n, y]], y = 1/z (common practice; the ideal
 * unit passes v1 = n·v2 at no load). Several windings on one core (turns N_k, leakage z_k each,
 * all non-zero): ampere-turn balance Σ N_k·i_k = 0 with v_k = N_k·e + z_k·i_k gives
 * Y_jk = δ_jk/z_j − (N_j/z_j)(N_k/z_k)/Σ(N_m²/z_m).
 * Each winding sits between a `pos` and a `neg` node; the stamp on the nodes is Aᵀ·Y·A with the
 * incidence A (+1 at pos, −1 at neg); a node shared by windings is summed into one row.
 */
import type { AdmittanceMatrixPrimitive, Cx } from '../types.ts';
import { add, div, inv, mul, neg, scale, sub, ZERO } from '../phasor.ts';

export interface Winding {
  pos: string;
  neg: string;
}

/** Winding-voltage admittance of a two-winding unit (leakage z referred to winding 2, n = N1/N2). */
export function twoWindingY(zOhmsWinding2: Cx, n: number): Cx[][] {
  const y = inv(zOhmsWinding2);
  return [
    [scale(y, 1 / (n * n)), scale(y, -1 / n)],
    [scale(y, -1 / n), y],
  ];
}

/** Winding-voltage admittance of a multi-winding unit with turns `turns` and leakage `z` (ohms) per winding. */
export function multiWindingY(turns: number[], z: Cx[]): Cx[][] {
  const d = turns.reduce((s, nk, k) => add(s, div({ re: nk * nk, im: 0 }, z[k])), ZERO);
  return turns.map((nj, j) =>
    turns.map((nk, k) => {
      const coupling = div(mul(div({ re: nj, im: 0 }, z[j]), div({ re: nk, im: 0 }, z[k])), d);
      return j === k ? sub(inv(z[j]), coupling) : neg(coupling);
    }),
  );
}

/** Admittance-matrix primitive of windings with winding-voltage admittance `yw`. */
export function windingStamp(id: string, windings: Winding[], yw: Cx[][]): AdmittanceMatrixPrimitive {
  const nodes: string[] = [];
  const index = (node: string) => {
    let i = nodes.indexOf(node);
    if (i < 0) i = nodes.push(node) - 1;
    return i;
  };
  const terms = windings.map((w) => [
    [index(w.pos), 1],
    [index(w.neg), -1],
  ]);
  const y: Cx[][] = nodes.map(() => nodes.map(() => ZERO));
  windings.forEach((_, j) =>
    windings.forEach((_, k) => {
      for (const [r, sr] of terms[j]) for (const [c, sc] of terms[k]) y[r][c] = add(y[r][c], scale(yw[j][k], sr * sc));
    }),
  );
  return { type: 'admittanceMatrix', id, nodes, siemens: y };
}
