/**
 * The nodal solve of a scanned primitive-only file (./scan-primitive-file.ts) straight from its
 * typed arrays: the same formulation, numbering, stamps, symbolic analysis and factorization as
 * the general solver (../solver/network.ts: supernodes of ideal sources, minimum-degree sparse LU
 * of ../solver/sparse-lu.ts), so the same floating-point operations in the same order and the
 * same last bits, without its per-element objects (one Int32Array of nodes per element, the
 * solution's Maps). Only what such files contain: impedances, ideal voltage sources, current
 * sources, every part tied to earth.
 *
 * Anything unusual returns undefined and the caller takes the general path, which reports it in
 * its own words: a loop of ideal sources, a part with no path to earth (a floating island, or one
 * found numerically by the LU), a non-finite voltage.
 */
import { analyzePattern, factorNumeric } from '../solver/sparse-lu.ts';
import { S_CURRENT_SOURCE, S_IMPEDANCE, S_VOLTAGE_SOURCE, type ScannedPrimitives } from './scan-primitive-file.ts';

/** Node voltages (by node number) and one current per element (the general solver's conventions). */
export interface ScannedSolution {
  vRe: Float64Array;
  vIm: Float64Array;
  cRe: Float64Array;
  cIm: Float64Array;
  maxKclResidualAmps: number;
}

/** Union–find with the general solver's rule (the lower root wins). */
function find(parent: Int32Array, x: number): number {
  while (parent[x] !== x) {
    parent[x] = parent[parent[x]];
    x = parent[x];
  }
  return x;
}
function union(parent: Int32Array, a: number, b: number): boolean {
  const ra = find(parent, a);
  const rb = find(parent, b);
  if (ra === rb) return false;
  if (ra < rb) parent[rb] = ra;
  else parent[ra] = rb;
  return true;
}

/**
 * Solve; undefined when the general path must take the file (see the module comment).
 * Each phase is a function of its own, run once: a single run of the CLI executes every loop
 * once, and a long function of many loops was optimized loop by loop, deoptimized each time the
 * next loop had no type feedback yet, and compiled again (seen with --trace-deopt).
 */
export function solveScanned(f: ScannedPrimitives): ScannedSolution | undefined {
  const forest = sourceForest(f);
  if (!forest) return undefined;
  const t = sourceTrees(f, forest);
  const { yRe, yIm } = admittances(f);
  const { offRe, offIm } = supernodeOffsets(f, t);
  const st = stamps(f, t, yRe, yIm, offRe, offIm);
  const { symbolic, positions } = analyzePattern(t.n, st.rows, st.cols, st.count);
  const { aRe, aIm } = assembled(symbolic.rowIdx.length, positions, st);
  const lu = factorNumeric(symbolic, aRe, aIm);
  if (lu.nullVectors.length > 0) return undefined; // a numerically floating part
  const x = lu.solve(st.rhsRe, st.rhsIm);
  if (!allFinite(x.re, x.im, t.n)) return undefined;
  const { vRe, vIm } = nodeVoltages(t, offRe, offIm, x.re, x.im);
  const { cRe, cIm, maxKcl } = currents(f, t, yRe, yIm, vRe, vIm);
  return { vRe, vIm, cRe, cIm, maxKclResidualAmps: maxKcl };
}

/** The ideal sources' forest (CSR adjacency, each node's edges in element order as the general solver lists them); undefined for a loop of ideal sources or a part with no path to earth. */
function sourceForest(f: ScannedPrimitives): { start: Int32Array; to: Int32Array; el: Int32Array } | undefined {
  const { count, kind, n1, n2 } = f;
  const nn = f.nodeNames.length;
  const zdsu = new Int32Array(nn);
  const dsu = new Int32Array(nn);
  for (let i = 0; i < nn; i++) zdsu[i] = dsu[i] = i;
  const deg = new Int32Array(nn + 1);
  for (let k = 0; k < count; k++) {
    const kk = kind[k];
    if (kk === S_CURRENT_SOURCE) continue;
    union(dsu, n1[k], n2[k]);
    if (kk === S_VOLTAGE_SOURCE) {
      if (!union(zdsu, n1[k], n2[k])) return undefined;
      deg[n1[k] + 1]++;
      deg[n2[k] + 1]++;
    }
  }
  if (!allTiedToEarth(dsu)) return undefined; // a floating part
  return forestAdjacency(f, deg);
}

function allTiedToEarth(dsu: Int32Array): boolean {
  const earthRoot = find(dsu, 0);
  for (let i = 1; i < dsu.length; i++) if (find(dsu, i) !== earthRoot) return false;
  return true;
}

/** The forest's CSR adjacency from each node's source count (deg[i + 1]). */
function forestAdjacency(f: ScannedPrimitives, deg: Int32Array): { start: Int32Array; to: Int32Array; el: Int32Array } {
  const { count, kind, n1, n2 } = f;
  const nn = deg.length - 1;
  for (let i = 0; i < nn; i++) deg[i + 1] += deg[i];
  const to = new Int32Array(deg[nn]);
  const el = new Int32Array(deg[nn]);
  const fill = deg.slice(0, nn);
  for (let k = 0; k < count; k++) {
    if (kind[k] !== S_VOLTAGE_SOURCE) continue;
    const a = n1[k];
    const b = n2[k];
    to[fill[a]] = b;
    el[fill[a]++] = k;
    to[fill[b]] = a;
    el[fill[b]++] = k;
  }
  return { start: deg, to, el };
}

/** Trees of the forest, breadth-first from each node in node order (earth first), and the unknowns (one per tree root other than earth's tree). */
interface Trees {
  treeParent: Int32Array;
  treeEdge: Int32Array;
  treeSign: Int8Array;
  /** Non-root tree nodes, parents before children. */
  order: Int32Array;
  unknownOf: Int32Array;
  n: number;
}
function sourceTrees(f: ScannedPrimitives, forest: { start: Int32Array; to: Int32Array; el: Int32Array }): Trees {
  const nn = f.nodeNames.length;
  const { start, to: adjTo, el: adjEl } = forest;
  const n1 = f.n1;
  const treeParent = new Int32Array(nn).fill(-1);
  const treeEdge = new Int32Array(nn).fill(-2);
  const treeSign = new Int8Array(nn);
  const rootOf = new Int32Array(nn).fill(-1);
  const order = new Int32Array(nn);
  let nOrder = 0;
  const queue = new Int32Array(nn);
  for (let s = 0; s < nn; s++) {
    if (rootOf[s] !== -1) continue;
    rootOf[s] = s;
    if (start[s + 1] === start[s]) continue;
    let qh = 0;
    let qt = 0;
    queue[qt++] = s;
    while (qh < qt) {
      const u = queue[qh++];
      for (let e = start[u]; e < start[u + 1]; e++) {
        const to = adjTo[e];
        if (rootOf[to] !== -1) continue;
        const el = adjEl[e];
        rootOf[to] = s;
        treeParent[to] = u;
        treeEdge[to] = el;
        treeSign[to] = n1[el] === to ? 1 : -1;
        order[nOrder++] = to;
        queue[qt++] = to;
      }
    }
  }
  const unknownOf = new Int32Array(nn).fill(-1);
  let n = 0;
  for (let i = 1; i < nn; i++) if (rootOf[i] === i) unknownOf[i] = n++;
  for (let i = 0; i < nn; i++) if (rootOf[i] !== i) unknownOf[i] = rootOf[i] === 0 ? -1 : unknownOf[rootOf[i]];
  return { treeParent, treeEdge, treeSign, order: order.subarray(0, nOrder), unknownOf, n };
}

/** 1/Z of every impedance, as the general solver compiles it. */
function admittances(f: ScannedPrimitives): { yRe: Float64Array; yIm: Float64Array } {
  const { count, kind } = f;
  const zr = f.re;
  const zi = f.im;
  const yRe = new Float64Array(count);
  const yIm = new Float64Array(count);
  for (let k = 0; k < count; k++) {
    if (kind[k] !== S_IMPEDANCE) continue;
    const d = zr[k] * zr[k] + zi[k] * zi[k];
    yRe[k] = zr[k] / d;
    yIm[k] = -zi[k] / d;
  }
  return { yRe, yIm };
}

/** Supernode offsets: V(child) = V(parent) ± EMF of the tree edge. */
function supernodeOffsets(f: ScannedPrimitives, t: Trees): { offRe: Float64Array; offIm: Float64Array } {
  const nn = f.nodeNames.length;
  const zr = f.re;
  const zi = f.im;
  const { order, treeParent, treeSign, treeEdge } = t;
  const offRe = new Float64Array(nn);
  const offIm = new Float64Array(nn);
  for (let q = 0; q < order.length; q++) {
    const c = order[q];
    const pnode = treeParent[c];
    let re = offRe[pnode];
    let im = offIm[pnode];
    const sg = treeSign[c];
    if (sg !== 0) {
      const el = treeEdge[c];
      re += sg * zr[el];
      im += sg * zi[el];
    }
    offRe[c] = re;
    offIm[c] = im;
  }
  return { offRe, offIm };
}

/** Recorded matrix entries (unknown indices and values, in the general solver's order) and the right-hand side. */
interface Stamps {
  rows: Int32Array;
  cols: Int32Array;
  valRe: Float64Array;
  valIm: Float64Array;
  count: number;
  rhsRe: Float64Array;
  rhsIm: Float64Array;
}

/**
 * Every matrix entry recorded with its value, in the general solver's order; the right-hand side
 * as it builds it (earth-fixed and offset nodes move to the right).
 */
function stamps(f: ScannedPrimitives, t: Trees, yRe: Float64Array, yIm: Float64Array, offRe: Float64Array, offIm: Float64Array): Stamps {
  const { count, kind, n1, n2 } = f;
  const zr = f.re;
  const zi = f.im;
  const { unknownOf, n } = t;
  let cap = 4 * count + 16;
  let rows = new Int32Array(cap);
  let cols = new Int32Array(cap);
  let valRe = new Float64Array(cap);
  let valIm = new Float64Array(cap);
  let nRec = 0;
  const rhsRe = new Float64Array(n);
  const rhsIm = new Float64Array(n);
  const entry = (r: number, c: number, yr: number, yi: number): void => {
    const ur = unknownOf[r];
    if (ur < 0) return;
    const uc = unknownOf[c];
    const orr = offRe[c];
    const oi = offIm[c];
    if (orr !== 0 || oi !== 0) {
      rhsRe[ur] -= yr * orr - yi * oi;
      rhsIm[ur] -= yr * oi + yi * orr;
    }
    if (uc < 0) return;
    if (nRec === cap) {
      cap *= 2;
      const r2 = new Int32Array(cap);
      r2.set(rows);
      rows = r2;
      const c2 = new Int32Array(cap);
      c2.set(cols);
      cols = c2;
      const v2 = new Float64Array(cap);
      v2.set(valRe);
      valRe = v2;
      const w2 = new Float64Array(cap);
      w2.set(valIm);
      valIm = w2;
    }
    rows[nRec] = ur;
    cols[nRec] = uc;
    valRe[nRec] = yr;
    valIm[nRec++] = yi;
  };
  const inject = (node: number, re: number, im: number): void => {
    const u = unknownOf[node];
    if (u < 0) return;
    rhsRe[u] += re;
    rhsIm[u] += im;
  };
  for (let k = 0; k < count; k++) {
    const kk = kind[k];
    const a = n1[k];
    const b = n2[k];
    if (kk === S_IMPEDANCE) {
      const yr = yRe[k];
      const yi = yIm[k];
      entry(a, a, yr, yi);
      entry(b, b, yr, yi);
      entry(a, b, -yr, -yi);
      entry(b, a, -yr, -yi);
    } else if (kk === S_CURRENT_SOURCE) {
      inject(b, zr[k], zi[k]);
      inject(a, -zr[k], -zi[k]);
    }
  }
  return { rows, cols, valRe, valIm, count: nRec, rhsRe, rhsIm };
}

/** The matrix values on the permuted pattern, added in the recorded order. */
function assembled(nnz: number, positions: Int32Array, st: Stamps): { aRe: Float64Array; aIm: Float64Array } {
  const aRe = new Float64Array(nnz);
  const aIm = new Float64Array(nnz);
  const { valRe, valIm } = st;
  for (let e = 0; e < st.count; e++) {
    const p = positions[e];
    aRe[p] += valRe[e];
    aIm[p] += valIm[e];
  }
  return { aRe, aIm };
}

function allFinite(re: Float64Array, im: Float64Array, n: number): boolean {
  for (let u = 0; u < n; u++) if (!Number.isFinite(re[u]) || !Number.isFinite(im[u])) return false;
  return true;
}

/** Node voltages: each node's offset plus its unknown's solution. */
function nodeVoltages(t: Trees, offRe: Float64Array, offIm: Float64Array, xRe: Float64Array, xIm: Float64Array): { vRe: Float64Array; vIm: Float64Array } {
  const nn = offRe.length;
  const unknownOf = t.unknownOf;
  const vRe = new Float64Array(nn);
  const vIm = new Float64Array(nn);
  for (let i = 0; i < nn; i++) {
    const u = unknownOf[i];
    vRe[i] = offRe[i] + (u >= 0 ? xRe[u] : 0);
    vIm[i] = offIm[i] + (u >= 0 ? xIm[u] : 0);
  }
  return { vRe, vIm };
}

/**
 * Currents through impedances and current sources directly, through ideal sources by KCL leaf to
 * root along each tree; the largest KCL residual as the general solver measures it.
 */
function currents(f: ScannedPrimitives, t: Trees, yRe: Float64Array, yIm: Float64Array, vRe: Float64Array, vIm: Float64Array): { cRe: Float64Array; cIm: Float64Array; maxKcl: number } {
  const { count, kind, n1, n2 } = f;
  const zr = f.re;
  const zi = f.im;
  const nn = vRe.length;
  const cRe = new Float64Array(count);
  const cIm = new Float64Array(count);
  const oRe = new Float64Array(nn);
  const oIm = new Float64Array(nn);
  for (let k = 0; k < count; k++) {
    const kk = kind[k];
    if (kk === S_VOLTAGE_SOURCE) continue;
    const a = n1[k];
    const b = n2[k];
    let ir: number;
    let ii: number;
    if (kk === S_IMPEDANCE) {
      const dr = vRe[a] - vRe[b];
      const di = vIm[a] - vIm[b];
      ir = yRe[k] * dr - yIm[k] * di;
      ii = yRe[k] * di + yIm[k] * dr;
    } else {
      ir = zr[k];
      ii = zi[k];
    }
    cRe[k] = ir;
    cIm[k] = ii;
    oRe[a] += ir;
    oIm[a] += ii;
    oRe[b] -= ir;
    oIm[b] -= ii;
  }
  const { order, treeParent, treeEdge, unknownOf } = t;
  for (let q = order.length - 1; q >= 0; q--) {
    const c = order[q];
    const pnode = treeParent[c];
    const el = treeEdge[c];
    const Fr = oRe[c];
    const Fi = oIm[c];
    oRe[pnode] += Fr;
    oIm[pnode] += Fi;
    const sign = n1[el] === c ? 1 : -1;
    cRe[el] = sign * Fr;
    cIm[el] = sign * Fi;
  }
  let maxKcl = 0;
  for (let i = 1; i < nn; i++) {
    if (treeParent[i] !== -1) continue;
    if (unknownOf[i] < 0) continue;
    maxKcl = Math.max(maxKcl, Math.hypot(oRe[i], oIm[i]));
  }
  return { cRe, cIm, maxKcl };
}
