/**
 * The primitive-level network solver: nodal analysis in complex arithmetic with ideal voltage
 * sources and closed switches folded in, a sparse LU with a cached symbolic analysis, floating
 * parts referenced and reported, and voltage-dependent (ZIP) loads solved iteratively.
 *
 * Formulation (why): the unknowns are node voltages only. Ideal voltage sources and closed
 * switches are zero-impedance edges; they form a spanning forest (a loop among them is ill-posed
 * and rejected before factoring). Each tree of that forest is a *supernode*: every node of the
 * tree is its root's voltage plus a fixed offset (the EMFs along the tree path), so the tree has
 * one unknown (none when it contains earth) and its KCL is the sum of its nodes' KCL. This keeps
 * the matrix a plain (structurally symmetric) nodal admittance matrix with no zero-diagonal
 * branch rows, which is what lets the LU pivot on the diagonal in a fill-reducing order (the
 * issue's measured prototype did the same). The currents of the ideal elements follow afterwards
 * from KCL, leaf to root, along each tree.
 *
 * Floating parts: connected components of the graph of conducting elements (impedances, sources,
 * coupled-branch conductors, closed switches, zip loads, admittance stamps through their non-zero
 * off-diagonal entries, and to earth through a non-zero row sum) that do not contain earth are
 * floating. Each is solved with a reference node held at 0 V to earth. Reference rule: among the
 * island's nodes sorted by name (code-unit order), the first whose last name segment (after '.',
 * ':', '/', '_' or '-') is "n" or "neutral" (case-insensitive); else the first whose last segment
 * is "star"; else the first node in sorted order. So an unearthed wye source is referred to its
 * neutral, and phase voltages "to earth" read as line-to-neutral voltages.
 * Parts that are only *numerically* floating (a delta winding coupled to the rest only through a
 * transformer admittance stamp) are found by the LU's rank-revealing border; their reference is
 * the node (supernode root) whose pivot vanished, chosen deterministically by the elimination order.
 */
import { IllPosedNetworkError, InvalidCircuitError, NonConvergenceError, SingularNetworkError } from '../errors.ts';
import type { Cx, FloatingIsland, Primitive, PrimitiveSolution, SolveOptions } from '../types.ts';
import { EARTH } from '../types.ts';
import { denseInverse, denseZeros } from './dense.ts';
import { analyzePattern, factorNumeric, type NumericLu, type SymbolicLu } from './sparse-lu.ts';
import { validatePrimitives } from './validate.ts';

/** Solver options: SolveOptions plus the low-voltage rule of voltage-dependent loads. */
export interface SolverOptions extends SolveOptions {
  /**
   * Terminal voltage (per unit of the load's ratedVolts) below which the constant-current and
   * constant-power parts of a zip load turn into the constant impedances they have at that
   * voltage (continuous there). Common practice to keep iterations from diverging as the voltage
   * collapses; default 0.7.
   */
  lowVoltagePu?: number;
}

/** Timing of the last solve, in milliseconds (for benchmarks). */
export interface SolveTimings {
  analyzeMs: number;
  assembleMs: number;
  factorMs: number;
  solveMs: number;
  totalMs: number;
}

/** A network of primitives prepared for repeated solves of one topology (live editing, sweeps). */
export interface Network {
  /** Number of unknowns of the reduced nodal system (supernodes, earth-tied nodes eliminated). */
  readonly size: number;
  /** Non-zeros of the LU factor (L and U, off-diagonal each). */
  readonly factorNonZeros: number;
  /**
   * Replace the primitives. Cheap when the topology is unchanged (same ids, kinds, nodes, switch
   * states, which sources have a series impedance, same admittance-stamp sparsity); otherwise the
   * network is re-analysed transparently.
   */
  update(primitives: readonly Primitive[]): void;
  /** Solve with the current values. */
  solve(options?: SolverOptions): PrimitiveSolution;
  /** Timings of the last `solve` (and of the analysis that preceded it, if any). */
  lastTimings(): SolveTimings;
}

/** Default convergence tolerance on zip-load terminal voltages, per unit of ratedVolts. */
export const DEFAULT_TOLERANCE = 1e-9;
/** Default iteration limit for voltage-dependent loads. */
export const DEFAULT_MAX_ITERATIONS = 100;
/** Default low-voltage threshold (per unit) of the constant-current and constant-power parts. */
export const DEFAULT_LOW_VOLTAGE_PU = 0.7;

const now = (): number => (typeof performance !== 'undefined' ? performance.now() : Date.now());

/** Solve a network of primitives once (conventions in types.ts). Throws the typed errors of errors.ts. */
export function solvePrimitives(primitives: readonly Primitive[], options?: SolverOptions): PrimitiveSolution {
  return createNetwork(primitives).solve(options);
}

/** Prepare a network for repeated solves; the symbolic analysis (ordering, fill pattern) is cached per topology. */
export function createNetwork(primitives: readonly Primitive[]): Network {
  validatePrimitives(primitives);
  let prims = primitives.slice();
  let t0 = now();
  let topo = buildTopology(prims);
  let analyzeMs = now() - t0;
  let timings: SolveTimings = { analyzeMs, assembleMs: 0, factorMs: 0, solveMs: 0, totalMs: 0 };
  return {
    get size() {
      return topo.nUnknowns;
    },
    get factorNonZeros() {
      return 2 * topo.symbolic.lnz;
    },
    update(next) {
      validatePrimitives(next);
      const copy = next.slice();
      if (!sameTopology(topo, copy)) {
        t0 = now();
        topo = buildTopology(copy);
        analyzeMs = now() - t0;
      }
      prims = copy;
    },
    solve(options) {
      const r = solveTopology(topo, prims, options ?? {}, analyzeMs);
      analyzeMs = 0;
      timings = r.timings;
      return r.solution;
    },
    lastTimings: () => timings,
  };
}

// ---------------------------------------------------------------------------------------------
// Topology: node numbering, components, floating islands, zero-impedance forest, symbolic LU.

interface Topology {
  prims: Primitive[];
  nodeNames: string[];
  nodeIndex: Map<string, number>;
  /** Node indices of each element (terminal order of the primitive). */
  elNodes: Int32Array[];
  /** Per node: its unknown, or −1 when its voltage is fixed by earth (through the zero-impedance forest). */
  unknownOf: Int32Array;
  nUnknowns: number;
  /** Per unknown: the node it stands for (the supernode root). */
  unknownNode: Int32Array;
  /** Non-root nodes of the zero-impedance trees, parents before children. */
  treeOrder: Int32Array;
  /** Per node: parent in its zero-impedance tree (−1 at roots and off-tree nodes). */
  treeParent: Int32Array;
  /** Per node: element of the edge to its parent (−1 for the virtual edge of a floating island's reference). */
  treeEdge: Int32Array;
  /** Per node: +1 if the node is the `plus` of its parent edge's source, −1 if its `minus`, 0 for a switch or virtual edge. */
  treeSign: Int8Array;
  /** Floating components found structurally, and their current sources (checked per solve). */
  islands: { island: FloatingIsland; nodeSet: Int32Array; currentSources: number[] }[];
  symbolic: SymbolicLu;
  positions: Int32Array;
  /** Per admittance-matrix element: its connectivity signature (sparsity and earth rows). */
  stampSignature: Map<number, string>;
  hasNonlinear: boolean;
}

class Dsu {
  parent: Int32Array;
  constructor(n: number) {
    this.parent = Int32Array.from({ length: n }, (_, i) => i);
  }
  find(x: number): number {
    const p = this.parent;
    while (p[x] !== x) {
      p[x] = p[p[x]];
      x = p[x];
    }
    return x;
  }
  union(a: number, b: number): boolean {
    const ra = this.find(a);
    const rb = this.find(b);
    if (ra === rb) return false;
    if (ra < rb) this.parent[rb] = ra;
    else this.parent[ra] = rb;
    return true;
  }
}

const NEUTRAL_NAME = /(^|[.:/_-])(n|neutral)$/i;
const STAR_NAME = /(^|[.:/_-])star$/i;

function cabs(c: Cx): number {
  return Math.hypot(c.re, c.im);
}

function isIdealSource(e: Primitive): boolean {
  return e.type === 'voltageSource' && (!e.seriesOhms || (e.seriesOhms.re === 0 && e.seriesOhms.im === 0));
}

/** Which node pairs an admittance stamp joins, and which of its rows leak to earth (non-zero row sum). */
function stampConnectivity(y: Cx[][]): { pairs: [number, number][]; earthRows: number[]; signature: string } {
  const n = y.length;
  const pairs: [number, number][] = [];
  const earthRows: number[] = [];
  let sig = '';
  for (let i = 0; i < n; i++) {
    let sr = 0;
    let si = 0;
    let rowMax = 0;
    for (let j = 0; j < n; j++) {
      const v = y[i][j];
      sr += v.re;
      si += v.im;
      rowMax = Math.max(rowMax, cabs(v));
      if (i !== j && (v.re !== 0 || v.im !== 0 || y[j][i].re !== 0 || y[j][i].im !== 0) && i < j) {
        pairs.push([i, j]);
        sig += `${i}-${j},`;
      }
    }
    if (Math.hypot(sr, si) > 1e-12 * rowMax) {
      earthRows.push(i);
      sig += `e${i},`;
    }
  }
  return { pairs, earthRows, signature: sig };
}

function sameTopology(t: Topology, prims: Primitive[]): boolean {
  const old = t.prims;
  if (old.length !== prims.length) return false;
  for (let k = 0; k < prims.length; k++) {
    const a = old[k];
    const b = prims[k];
    if (a.type !== b.type || a.id !== b.id) return false;
    switch (a.type) {
      case 'impedance':
      case 'currentSource':
      case 'zipLoad': {
        const bb = b as typeof a;
        if (a.from !== bb.from || a.to !== bb.to) return false;
        if (a.type === 'zipLoad') {
          const z = (bb as typeof a).zip;
          if ((a.zip.z === 1) !== (z.z === 1)) return false; // linearity decides the iteration path only
        }
        break;
      }
      case 'switch': {
        const bb = b as typeof a;
        if (a.from !== bb.from || a.to !== bb.to || a.closed !== bb.closed) return false;
        break;
      }
      case 'voltageSource': {
        const bb = b as typeof a;
        if (a.plus !== bb.plus || a.minus !== bb.minus || isIdealSource(a) !== isIdealSource(bb)) return false;
        break;
      }
      case 'coupledBranch': {
        const bb = b as typeof a;
        if (a.from.length !== bb.from.length) return false;
        for (let c = 0; c < a.from.length; c++) if (a.from[c] !== bb.from[c] || a.to[c] !== bb.to[c]) return false;
        break;
      }
      case 'admittanceMatrix': {
        const bb = b as typeof a;
        if (a.nodes.length !== bb.nodes.length) return false;
        for (let c = 0; c < a.nodes.length; c++) if (a.nodes[c] !== bb.nodes[c]) return false;
        if (stampConnectivity(bb.siemens).signature !== t.stampSignature.get(k)) return false;
        break;
      }
    }
  }
  return true;
}

function elementNodes(e: Primitive): string[] {
  switch (e.type) {
    case 'impedance':
    case 'currentSource':
    case 'switch':
    case 'zipLoad':
      return [e.from, e.to];
    case 'voltageSource':
      return [e.plus, e.minus];
    case 'coupledBranch':
      return [...e.from, ...e.to];
    case 'admittanceMatrix':
      return e.nodes;
  }
}

function buildTopology(prims: Primitive[]): Topology {
  const nodeIndex = new Map<string, number>([[EARTH, 0]]);
  const nodeNames: string[] = [EARTH];
  const elNodes: Int32Array[] = new Array(prims.length);
  for (let k = 0; k < prims.length; k++) {
    const names = elementNodes(prims[k]);
    const idx = new Int32Array(names.length);
    for (let c = 0; c < names.length; c++) {
      let i = nodeIndex.get(names[c]);
      if (i === undefined) {
        i = nodeNames.length;
        nodeIndex.set(names[c], i);
        nodeNames.push(names[c]);
      }
      idx[c] = i;
    }
    elNodes[k] = idx;
  }
  const nn = nodeNames.length;

  // 1. Zero-impedance loops (ideal sources, closed switches): ill-posed, rejected first.
  const zdsu = new Dsu(nn);
  const fAdj: { to: number; el: number }[][] = Array.from({ length: nn }, () => []);
  for (let k = 0; k < prims.length; k++) {
    const e = prims[k];
    const zeroImpedance = (e.type === 'switch' && e.closed) || isIdealSource(e);
    if (!zeroImpedance) continue;
    const [a, b] = elNodes[k];
    if (!zdsu.union(a, b)) throw zeroImpedanceLoopError(prims, k, forestPath(fAdj, a, b));
    fAdj[a].push({ to: b, el: k });
    fAdj[b].push({ to: a, el: k });
  }

  // 2. Galvanic components and floating islands.
  const dsu = new Dsu(nn);
  const stampSignature = new Map<number, string>();
  let hasNonlinear = false;
  for (let k = 0; k < prims.length; k++) {
    const e = prims[k];
    const nodes = elNodes[k];
    switch (e.type) {
      case 'impedance':
      case 'voltageSource':
      case 'zipLoad':
        dsu.union(nodes[0], nodes[1]);
        if (e.type === 'zipLoad' && e.zip.z !== 1) hasNonlinear = true;
        break;
      case 'switch':
        if (e.closed) dsu.union(nodes[0], nodes[1]);
        break;
      case 'coupledBranch': {
        const n = e.from.length;
        for (let c = 0; c < n; c++) dsu.union(nodes[c], nodes[n + c]);
        break;
      }
      case 'admittanceMatrix': {
        const con = stampConnectivity(e.siemens);
        stampSignature.set(k, con.signature);
        for (const [i, j] of con.pairs) dsu.union(nodes[i], nodes[j]);
        for (const i of con.earthRows) dsu.union(nodes[i], 0);
        break;
      }
      case 'currentSource':
        break;
    }
  }
  const compMembers = new Map<number, number[]>();
  for (let i = 0; i < nn; i++) {
    const r = dsu.find(i);
    let list = compMembers.get(r);
    if (!list) compMembers.set(r, (list = []));
    list.push(i);
  }
  const earthRoot = dsu.find(0);
  const islands: Topology['islands'] = [];
  const islandOfRoot = new Map<number, number>();
  for (const [root, members] of compMembers) {
    if (root === earthRoot) continue;
    const names = members.map((i) => nodeNames[i]).sort();
    const ref = names.find((s) => NEUTRAL_NAME.test(s)) ?? names.find((s) => STAR_NAME.test(s)) ?? names[0];
    islandOfRoot.set(root, islands.length);
    islands.push({ island: { nodes: names, referenceNode: ref }, nodeSet: Int32Array.from(members), currentSources: [] });
  }
  for (let k = 0; k < prims.length; k++) {
    if (prims[k].type !== 'currentSource') continue;
    const [a, b] = elNodes[k];
    const ia = islandOfRoot.get(dsu.find(a));
    const ib = islandOfRoot.get(dsu.find(b));
    if (ia !== undefined) islands[ia].currentSources.push(k);
    if (ib !== undefined && ib !== ia) islands[ib].currentSources.push(k);
  }
  // the reference of each island is tied to earth by a virtual zero-impedance edge
  const VIRTUAL = -1;
  for (const isl of islands) {
    const r = nodeIndex.get(isl.island.referenceNode)!;
    zdsu.union(r, 0);
    fAdj[r].push({ to: 0, el: VIRTUAL });
    fAdj[0].push({ to: r, el: VIRTUAL });
  }

  // 3. Zero-impedance trees (BFS from earth first, then from the lowest-numbered node of each tree).
  const treeParent = new Int32Array(nn).fill(-1);
  const treeEdge = new Int32Array(nn).fill(-2);
  const treeSign = new Int8Array(nn);
  const rootOf = new Int32Array(nn).fill(-1);
  const order: number[] = [];
  for (let s = 0; s < nn; s++) {
    if (rootOf[s] !== -1) continue;
    rootOf[s] = s;
    if (fAdj[s].length === 0) continue;
    const queue = [s];
    for (let q = 0; q < queue.length; q++) {
      const u = queue[q];
      for (const { to, el } of fAdj[u]) {
        if (rootOf[to] !== -1) continue;
        rootOf[to] = s;
        treeParent[to] = u;
        treeEdge[to] = el;
        if (el >= 0 && prims[el].type === 'voltageSource') treeSign[to] = elNodes[el][0] === to ? 1 : -1;
        order.push(to);
        queue.push(to);
      }
    }
  }
  const unknownOf = new Int32Array(nn).fill(-1);
  const unknownNodeList: number[] = [];
  for (let i = 0; i < nn; i++) {
    if (rootOf[i] !== i || i === 0) continue;
    unknownOf[i] = unknownNodeList.length;
    unknownNodeList.push(i);
  }
  for (let i = 0; i < nn; i++) if (rootOf[i] !== i) unknownOf[i] = rootOf[i] === 0 ? -1 : unknownOf[rootOf[i]];
  const nUnknowns = unknownNodeList.length;

  const topo: Topology = {
    prims,
    nodeNames,
    nodeIndex,
    elNodes,
    unknownOf,
    nUnknowns,
    unknownNode: Int32Array.from(unknownNodeList),
    treeOrder: Int32Array.from(order),
    treeParent,
    treeEdge,
    treeSign,
    islands,
    symbolic: undefined as unknown as SymbolicLu,
    positions: new Int32Array(0),
    stampSignature,
    hasNonlinear,
  };

  // 4. Pattern pass: record the matrix entries the stamps touch, then the symbolic analysis.
  const rec = { rows: [] as number[], cols: [] as number[] };
  const asm = makeAssembler(topo, nUnknowns, rec, null);
  asm.stampAll(prims);
  const { symbolic, positions } = analyzePattern(nUnknowns, Int32Array.from(rec.rows), Int32Array.from(rec.cols), rec.rows.length);
  topo.symbolic = symbolic;
  topo.positions = positions;
  return topo;
}

/** Path between a and b in the zero-impedance forest (element indices), for the loop message. */
function forestPath(fAdj: { to: number; el: number }[][], a: number, b: number): number[] {
  const prev = new Map<number, { from: number; el: number }>([[a, { from: -1, el: -1 }]]);
  const queue = [a];
  for (let q = 0; q < queue.length && !prev.has(b); q++) {
    const u = queue[q];
    for (const { to, el } of fAdj[u]) {
      if (prev.has(to)) continue;
      prev.set(to, { from: u, el });
      queue.push(to);
    }
  }
  const path: number[] = [];
  for (let x = b; x !== a; ) {
    const p = prev.get(x)!;
    path.push(p.el);
    x = p.from;
  }
  return path.reverse();
}

function fmtV(c: Cx): string {
  const mag = cabs(c);
  const ang = (Math.atan2(c.im, c.re) * 180) / Math.PI;
  return `${+mag.toPrecision(6)} V ∠${+ang.toFixed(3)}°`;
}

function zeroImpedanceLoopError(prims: Primitive[], closing: number, path: number[]): IllPosedNetworkError {
  const loop = [...path, closing];
  const ids = loop.map((k) => prims[k].id);
  const sources = loop.filter((k) => prims[k].type === 'voltageSource');
  const switches = loop.filter((k) => prims[k].type === 'switch');
  const q = (ks: number[]) => ks.map((k) => `'${prims[k].id}'`).join(', ');
  const nodesOf = (ks: number[]) => [...new Set(ks.flatMap((k) => elementNodes(prims[k])))];
  if (sources.length === 0) {
    return new IllPosedNetworkError(
      `Closed switches ${q(switches)} form a loop with no impedance: the current division between them is undefined (open one of them or give the path an impedance).`,
      { elementIds: ids, nodes: nodesOf(loop) },
    );
  }
  if (sources.length === 1) {
    const s = prims[sources[0]] as Extract<Primitive, { type: 'voltageSource' }>;
    return new IllPosedNetworkError(
      `Voltage source '${s.id}' is shorted by closed switch${switches.length > 1 ? 'es' : ''} ${q(switches)} (nodes '${s.plus}' and '${s.minus}' joined with no impedance).`,
      { elementIds: ids, nodes: [s.plus, s.minus] },
    );
  }
  // EMF around the loop: walk the loop from the closing element's minus terminal.
  let emf = { re: 0, im: 0 };
  const closingEl = prims[closing];
  const ends = elementNodes(closingEl);
  let at = ends[1];
  const walk = [closing, ...path.slice().reverse()];
  // orient every element along the walk: closing goes ends[0] → ends[1], then path back to ends[0]
  at = ends[0];
  for (const k of walk) {
    const [x, y] = elementNodes(prims[k]);
    const next = x === at ? y : x;
    const e = prims[k];
    if (e.type === 'voltageSource') {
      // going minus → plus adds the EMF, plus → minus subtracts it
      const sign = e.minus === at ? 1 : -1;
      emf = { re: emf.re + sign * e.volts.re, im: emf.im + sign * e.volts.im };
    }
    at = next;
  }
  const sum = cabs(emf);
  const scale = Math.max(...sources.map((k) => cabs((prims[k] as Extract<Primitive, { type: 'voltageSource' }>).volts)));
  const equal = sum <= 1e-9 * Math.max(scale, 1e-30);
  const sw = switches.length > 0 ? ` with closed switch${switches.length > 1 ? 'es' : ''} ${q(switches)}` : '';
  const detail = equal
    ? 'their voltages agree around the loop, but the current circulating between them is still undetermined'
    : `their voltages disagree by ${fmtV(emf)} around the loop, which no current can satisfy`;
  return new IllPosedNetworkError(
    `Ideal voltage sources ${q(sources)}${sw} form a loop with no series impedance: ${detail}. Give one of them a series impedance or remove one.`,
    { elementIds: ids, nodes: nodesOf(loop) },
  );
}

// ---------------------------------------------------------------------------------------------
// Assembly: stamps into the permuted value arrays (positions recorded once per topology).

interface Assembler {
  offRe: Float64Array;
  offIm: Float64Array;
  rhsRe: Float64Array;
  rhsIm: Float64Array;
  aRe: Float64Array;
  aIm: Float64Array;
  /** Inverse impedance matrices of coupled branches (by element index), set by stampAll. */
  coupledY: Map<number, { re: Float64Array; im: Float64Array }>;
  stampAll(prims: Primitive[]): void;
}

function makeAssembler(
  t: Topology,
  n: number,
  rec: { rows: number[]; cols: number[] } | null,
  values: { nnz: number } | null,
): Assembler {
  const nn = t.nodeNames.length;
  const unknownOf = t.unknownOf;
  const offRe = new Float64Array(nn);
  const offIm = new Float64Array(nn);
  const rhsRe = new Float64Array(n);
  const rhsIm = new Float64Array(n);
  const aRe = new Float64Array(values ? values.nnz : 0);
  const aIm = new Float64Array(values ? values.nnz : 0);
  const positions = t.positions;
  const coupledY = new Map<number, { re: Float64Array; im: Float64Array }>();
  let cursor = 0;

  /** Nodal entry: current into the element at node r gains y·V(c). */
  const entry = (r: number, c: number, yr: number, yi: number): void => {
    const ur = unknownOf[r];
    if (ur < 0) return; // KCL at an earth-fixed node is not an equation
    const uc = unknownOf[c];
    const orr = offRe[c];
    const oi = offIm[c];
    if (orr !== 0 || oi !== 0) {
      rhsRe[ur] -= yr * orr - yi * oi;
      rhsIm[ur] -= yr * oi + yi * orr;
    }
    if (uc < 0) return;
    if (rec) {
      rec.rows.push(ur);
      rec.cols.push(uc);
    } else {
      const p = positions[cursor++];
      aRe[p] += yr;
      aIm[p] += yi;
    }
  };
  const branch = (a: number, b: number, yr: number, yi: number): void => {
    entry(a, a, yr, yi);
    entry(b, b, yr, yi);
    entry(a, b, -yr, -yi);
    entry(b, a, -yr, -yi);
  };
  const inject = (node: number, re: number, im: number): void => {
    const u = unknownOf[node];
    if (u < 0) return;
    rhsRe[u] += re;
    rhsIm[u] += im;
  };

  const stampAll = (prims: Primitive[]): void => {
    cursor = 0;
    rhsRe.fill(0);
    rhsIm.fill(0);
    aRe.fill(0);
    aIm.fill(0);
    offRe.fill(0);
    offIm.fill(0);
    // supernode offsets: V(child) = V(parent) ± EMF of the tree edge
    const order = t.treeOrder;
    for (let q = 0; q < order.length; q++) {
      const c = order[q];
      const p = t.treeParent[c];
      let re = offRe[p];
      let im = offIm[p];
      const s = t.treeSign[c];
      if (s !== 0) {
        const v = (prims[t.treeEdge[c]] as Extract<Primitive, { type: 'voltageSource' }>).volts;
        re += s * v.re;
        im += s * v.im;
      }
      offRe[c] = re;
      offIm[c] = im;
    }
    for (let k = 0; k < prims.length; k++) {
      const e = prims[k];
      const nodes = t.elNodes[k];
      switch (e.type) {
        case 'impedance': {
          const d = e.ohms.re * e.ohms.re + e.ohms.im * e.ohms.im;
          branch(nodes[0], nodes[1], e.ohms.re / d, -e.ohms.im / d);
          break;
        }
        case 'voltageSource': {
          if (isIdealSource(e)) break;
          const z = e.seriesOhms!;
          const d = z.re * z.re + z.im * z.im;
          const yr = z.re / d;
          const yi = -z.im / d;
          branch(nodes[0], nodes[1], yr, yi);
          // Norton equivalent: E/Zs injected into plus, drawn from minus
          const jr = e.volts.re * yr - e.volts.im * yi;
          const ji = e.volts.re * yi + e.volts.im * yr;
          inject(nodes[0], jr, ji);
          inject(nodes[1], -jr, -ji);
          break;
        }
        case 'currentSource':
          inject(nodes[1], e.amps.re, e.amps.im);
          inject(nodes[0], -e.amps.re, -e.amps.im);
          break;
        case 'switch':
          break;
        case 'coupledBranch': {
          const m = e.from.length;
          const z = denseZeros(m);
          for (let i = 0; i < m; i++)
            for (let j = 0; j < m; j++) {
              z.re[i * m + j] = e.ohms[i][j].re;
              z.im[i * m + j] = e.ohms[i][j].im;
            }
          const y = denseInverse(z);
          if (!y)
            throw new InvalidCircuitError(
              `Invalid circuit: coupled branch '${e.id}' has a singular impedance matrix (a conductor with zero impedance?); use switches for direct connections`,
              [{ path: `elements[${k}].ohms`, message: 'singular impedance matrix' }],
              { elementIds: [e.id] },
            );
          coupledY.set(k, { re: y.re, im: y.im });
          for (let i = 0; i < m; i++)
            for (let j = 0; j < m; j++) {
              const yr = y.re[i * m + j];
              const yi = y.im[i * m + j];
              entry(nodes[i], nodes[j], yr, yi);
              entry(nodes[m + i], nodes[m + j], yr, yi);
              entry(nodes[i], nodes[m + j], -yr, -yi);
              entry(nodes[m + i], nodes[j], -yr, -yi);
            }
          break;
        }
        case 'admittanceMatrix': {
          const m = e.nodes.length;
          for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) entry(nodes[i], nodes[j], e.siemens[i][j].re, e.siemens[i][j].im);
          break;
        }
        case 'zipLoad': {
          // the whole rated power as an impedance in the matrix; the rest is a correcting injection
          const v2 = e.ratedVolts * e.ratedVolts;
          branch(nodes[0], nodes[1], e.ratedVA.re / v2, -e.ratedVA.im / v2);
          break;
        }
      }
    }
  };
  return { offRe, offIm, rhsRe, rhsIm, aRe, aIm, coupledY, stampAll };
}

// ---------------------------------------------------------------------------------------------
// Solve: factor, iterate voltage-dependent loads, recover currents.

type ZipLoad = Extract<Primitive, { type: 'zipLoad' }>;

/** Current drawn by a zip load (from → to) at terminal voltage V = vr + j·vi, with the low-voltage rule. */
function zipCurrent(e: ZipLoad, vr: number, vi: number, lowPu: number): [number, number] {
  const vrated = e.ratedVolts;
  const m2 = vr * vr + vi * vi;
  const m = Math.sqrt(m2);
  const pu = m / vrated;
  const sr = e.ratedVA.re;
  const si = e.ratedVA.im;
  // I = g·V with g = conj(S_part)·factor
  let f = e.zip.z / (vrated * vrated);
  if (pu >= lowPu && m > 0) {
    f += e.zip.i / (vrated * m) + e.zip.p / m2;
  } else {
    f += e.zip.i / (lowPu * vrated * vrated) + e.zip.p / (lowPu * lowPu * vrated * vrated);
  }
  const gr = sr * f;
  const gi = -si * f;
  return [gr * vr - gi * vi, gr * vi + gi * vr];
}

function solveTopology(
  t: Topology,
  prims: Primitive[],
  options: SolverOptions,
  analyzeMs: number,
): { solution: PrimitiveSolution; timings: SolveTimings } {
  const tStart = now();
  const tol = options.tolerance ?? DEFAULT_TOLERANCE;
  const maxIter = options.maxIterations ?? DEFAULT_MAX_ITERATIONS;
  const lowPu = options.lowVoltagePu ?? DEFAULT_LOW_VOLTAGE_PU;
  if (!(tol > 0) || !Number.isFinite(tol)) throw new InvalidCircuitError(`Invalid solve options: tolerance must be a positive number (got ${tol})`);
  if (!Number.isInteger(maxIter) || maxIter < 1) throw new InvalidCircuitError(`Invalid solve options: maxIterations must be a positive integer (got ${maxIter})`);
  if (!(lowPu > 0 && lowPu <= 1)) throw new InvalidCircuitError(`Invalid solve options: lowVoltagePu must be in (0, 1] (got ${lowPu})`);

  checkCurrentSourceCutSets(t, prims);

  const n = t.nUnknowns;
  const s = t.symbolic;
  const asm = makeAssembler(t, n, null, { nnz: s.rowIdx.length });
  asm.stampAll(prims);
  const tAsm = now();
  const lu = factorNumeric(s, asm.aRe, asm.aIm);
  const tFac = now();

  const nn = t.nodeNames.length;
  const vRe = new Float64Array(nn);
  const vIm = new Float64Array(nn);
  const setVoltages = (x: { re: Float64Array; im: Float64Array }) => {
    for (let i = 0; i < nn; i++) {
      const u = t.unknownOf[i];
      vRe[i] = asm.offRe[i] + (u >= 0 ? x.re[u] : 0);
      vIm[i] = asm.offIm[i] + (u >= 0 ? x.im[u] : 0);
    }
  };

  const zipIdx: number[] = [];
  for (let k = 0; k < prims.length; k++) if (prims[k].type === 'zipLoad' && (prims[k] as ZipLoad).zip.z !== 1) zipIdx.push(k);

  let iterations = 1;
  let x = lu.solve(asm.rhsRe, asm.rhsIm);
  checkFinite(x, t);
  setVoltages(x);
  if (zipIdx.length > 0) {
    const nz = zipIdx.length;
    const prevRe = new Float64Array(nz);
    const prevIm = new Float64Array(nz);
    const corrRe = new Float64Array(nz);
    const corrIm = new Float64Array(nz);
    const bRe = new Float64Array(n);
    const bIm = new Float64Array(n);
    const terminal = (a: number) => {
      const [f, to] = t.elNodes[zipIdx[a]];
      return [vRe[f] - vRe[to], vIm[f] - vIm[to]];
    };
    for (let a = 0; a < nz; a++) [prevRe[a], prevIm[a]] = terminal(a);
    let converged = false;
    const lastChange = new Float64Array(nz);
    while (iterations < maxIter) {
      // correction c = I(V) − y0·V for each load, injected as −c at `from`, +c at `to`
      bRe.set(asm.rhsRe);
      bIm.set(asm.rhsIm);
      for (let a = 0; a < nz; a++) {
        const e = prims[zipIdx[a]] as ZipLoad;
        const [vr, vi] = [prevRe[a], prevIm[a]];
        const [ir, ii] = zipCurrent(e, vr, vi, lowPu);
        const v2 = e.ratedVolts * e.ratedVolts;
        const y0r = e.ratedVA.re / v2;
        const y0i = -e.ratedVA.im / v2;
        corrRe[a] = ir - (y0r * vr - y0i * vi);
        corrIm[a] = ii - (y0r * vi + y0i * vr);
        const [f, to] = t.elNodes[zipIdx[a]];
        const uf = t.unknownOf[f];
        const ut = t.unknownOf[to];
        if (uf >= 0) {
          bRe[uf] -= corrRe[a];
          bIm[uf] -= corrIm[a];
        }
        if (ut >= 0) {
          bRe[ut] += corrRe[a];
          bIm[ut] += corrIm[a];
        }
      }
      x = lu.solve(bRe, bIm);
      iterations++;
      let finite = true;
      for (let u = 0; u < n; u++) if (!Number.isFinite(x.re[u]) || !Number.isFinite(x.im[u])) finite = false;
      if (!finite) break;
      setVoltages(x);
      let worst = 0;
      for (let a = 0; a < nz; a++) {
        const [vr, vi] = terminal(a);
        const e = prims[zipIdx[a]] as ZipLoad;
        const ch = Math.hypot(vr - prevRe[a], vi - prevIm[a]) / e.ratedVolts;
        lastChange[a] = ch;
        if (ch > worst) worst = ch;
        prevRe[a] = vr;
        prevIm[a] = vi;
      }
      if (worst < tol) {
        converged = true;
        break;
      }
      if (!(worst < 1e3)) break; // diverging
    }
    if (!converged) throw nonConvergence(t, prims, zipIdx, vRe, vIm, corrRe, corrIm, lastChange, iterations, lowPu);
  }
  const tSol = now();

  const { currents, maxKcl } = elementCurrents(t, prims, asm, vRe, vIm, lowPu);
  const nodeVolts = new Map<string, Cx>();
  for (let i = 0; i < nn; i++) nodeVolts.set(t.nodeNames[i], { re: vRe[i], im: vIm[i] });
  const floating: FloatingIsland[] = t.islands.map((i) => ({ nodes: i.island.nodes.slice(), referenceNode: i.island.referenceNode }));
  floating.push(...numericIslands(t, lu));
  const tEnd = now();
  return {
    solution: { nodeVolts, elementCurrents: currents, floating, iterations, maxKclResidualAmps: maxKcl },
    timings: {
      analyzeMs,
      assembleMs: tAsm - tStart,
      factorMs: tFac - tAsm,
      solveMs: tSol - tFac,
      totalMs: tEnd - tStart + analyzeMs,
    },
  };
}

function checkFinite(x: { re: Float64Array; im: Float64Array }, t: Topology): void {
  for (let u = 0; u < x.re.length; u++) {
    if (!Number.isFinite(x.re[u]) || !Number.isFinite(x.im[u])) {
      const node = t.nodeNames[t.unknownNode[u]];
      throw new SingularNetworkError(
        `The network matrix is numerically singular: the voltage of node '${node}' came out non-finite. Check for extreme impedance ratios or a part of the network held only by ideal elements.`,
        { nodes: [node] },
      );
    }
  }
}

/** A floating island whose current sources do not sum to zero has nowhere for that current to flow. */
function checkCurrentSourceCutSets(t: Topology, prims: Primitive[]): void {
  for (const isl of t.islands) {
    if (isl.currentSources.length === 0) continue;
    const inside = new Set(isl.nodeSet);
    let re = 0;
    let im = 0;
    let scale = 0;
    for (const k of isl.currentSources) {
      const e = prims[k] as Extract<Primitive, { type: 'currentSource' }>;
      const [a, b] = t.elNodes[k];
      const sgn = (inside.has(b) ? 1 : 0) - (inside.has(a) ? 1 : 0);
      re += sgn * e.amps.re;
      im += sgn * e.amps.im;
      scale = Math.max(scale, cabs(e.amps));
    }
    if (Math.hypot(re, im) > 1e-12 * scale && scale > 0) {
      const ids = isl.currentSources.map((k) => prims[k].id);
      const names = isl.island.nodes;
      const where =
        names.length === 1
          ? `node '${names[0]}', which has`
          : `nodes ${names
              .slice(0, 6)
              .map((s) => `'${s}'`)
              .join(', ')}${names.length > 6 ? ', …' : ''}, which have`;
      throw new IllPosedNetworkError(
        `Current source${ids.length > 1 ? 's' : ''} ${ids.map((s) => `'${s}'`).join(', ')} drive${ids.length > 1 ? '' : 's'} a net ${+Math.hypot(re, im).toPrecision(6)} A into ${where} no other connection to the network: the current has nowhere to flow.`,
        { elementIds: ids, nodes: isl.island.nodes },
      );
    }
  }
}

function numericIslands(t: Topology, lu: NumericLu): FloatingIsland[] {
  const out: FloatingIsland[] = [];
  for (const nv of lu.nullVectors) {
    let vmax = 0;
    for (let u = 0; u < nv.re.length; u++) vmax = Math.max(vmax, Math.hypot(nv.re[u], nv.im[u]));
    const nodes: string[] = [];
    for (let i = 0; i < t.nodeNames.length; i++) {
      const u = t.unknownOf[i];
      if (u >= 0 && Math.hypot(nv.re[u], nv.im[u]) > 1e-6 * vmax) nodes.push(t.nodeNames[i]);
    }
    nodes.sort();
    out.push({ nodes, referenceNode: t.nodeNames[t.unknownNode[nv.unknown]] });
  }
  return out;
}

function nonConvergence(
  t: Topology,
  prims: Primitive[],
  zipIdx: number[],
  vRe: Float64Array,
  vIm: Float64Array,
  corrRe: Float64Array,
  corrIm: Float64Array,
  lastChange: Float64Array,
  iterations: number,
  lowPu: number,
): NonConvergenceError {
  // Worst mismatch: the load whose law I(V) differs most, in VA, from the current the last linear
  // solve gave it (y0·V + correction), at the last voltages.
  let worst = 0;
  let worstVa = -1;
  const mismatch = new Float64Array(zipIdx.length);
  for (let a = 0; a < zipIdx.length; a++) {
    const e = prims[zipIdx[a]] as ZipLoad;
    const [f, to] = t.elNodes[zipIdx[a]];
    const vr = vRe[f] - vRe[to];
    const vi = vIm[f] - vIm[to];
    const v2 = e.ratedVolts * e.ratedVolts;
    const y0r = e.ratedVA.re / v2;
    const y0i = -e.ratedVA.im / v2;
    const [ir, ii] = zipCurrent(e, vr, vi, lowPu);
    const dr = y0r * vr - y0i * vi + corrRe[a] - ir;
    const di = y0r * vi + y0i * vr + corrIm[a] - ii;
    const va = Math.hypot(vr, vi) * Math.hypot(dr, di);
    mismatch[a] = Number.isFinite(va) ? va : Infinity;
    if (mismatch[a] > worstVa) {
      worstVa = mismatch[a];
      worst = a;
    }
  }
  const e = prims[zipIdx[worst]] as ZipLoad;
  const [f, to] = t.elNodes[zipIdx[worst]];
  const vr = vRe[f] - vRe[to];
  const vi = vIm[f] - vIm[to];
  const pu = Math.hypot(vr, vi) / e.ratedVolts;
  const puText = Number.isFinite(pu) ? `${pu.toFixed(3)} pu` : 'not finite';
  return new NonConvergenceError(
    `Voltage-dependent loads did not converge in ${iterations} iterations (possible voltage collapse: the loads ask for more power than the network can deliver). Worst mismatch at load '${e.id}': ${+mismatch[worst].toPrecision(4)} VA at terminal voltage ${puText} (last change ${lastChange[worst].toExponential(2)} pu; rated ${e.ratedVA.re} + j${e.ratedVA.im} VA at ${e.ratedVolts} V).`,
    { elementIds: [e.id], nodes: [e.from, e.to] },
  );
}

function elementCurrents(
  t: Topology,
  prims: Primitive[],
  asm: Assembler,
  vRe: Float64Array,
  vIm: Float64Array,
  lowPu: number,
): { currents: Map<string, Cx[]>; maxKcl: number } {
  const nn = t.nodeNames.length;
  // outflow[i]: current leaving node i into the (non-tree) elements
  const oRe = new Float64Array(nn);
  const oIm = new Float64Array(nn);
  const out = (i: number, re: number, im: number) => {
    oRe[i] += re;
    oIm[i] += im;
  };
  const currents = new Map<string, Cx[]>();
  const treeEls: number[] = [];
  for (let k = 0; k < prims.length; k++) {
    const e = prims[k];
    const nodes = t.elNodes[k];
    switch (e.type) {
      case 'impedance': {
        const dr = vRe[nodes[0]] - vRe[nodes[1]];
        const di = vIm[nodes[0]] - vIm[nodes[1]];
        const d = e.ohms.re * e.ohms.re + e.ohms.im * e.ohms.im;
        const ir = (dr * e.ohms.re + di * e.ohms.im) / d;
        const ii = (di * e.ohms.re - dr * e.ohms.im) / d;
        currents.set(e.id, [{ re: ir, im: ii }]);
        out(nodes[0], ir, ii);
        out(nodes[1], -ir, -ii);
        break;
      }
      case 'voltageSource': {
        if (isIdealSource(e)) {
          treeEls.push(k);
          break;
        }
        // I = (E − (V+ − V−)) / Zs, leaving plus into the circuit
        const z = e.seriesOhms!;
        const dr = e.volts.re - (vRe[nodes[0]] - vRe[nodes[1]]);
        const di = e.volts.im - (vIm[nodes[0]] - vIm[nodes[1]]);
        const d = z.re * z.re + z.im * z.im;
        const ir = (dr * z.re + di * z.im) / d;
        const ii = (di * z.re - dr * z.im) / d;
        currents.set(e.id, [{ re: ir, im: ii }]);
        out(nodes[0], -ir, -ii);
        out(nodes[1], ir, ii);
        break;
      }
      case 'currentSource':
        currents.set(e.id, [{ re: e.amps.re, im: e.amps.im }]);
        out(nodes[0], e.amps.re, e.amps.im);
        out(nodes[1], -e.amps.re, -e.amps.im);
        break;
      case 'switch':
        if (e.closed) treeEls.push(k);
        else currents.set(e.id, [{ re: 0, im: 0 }]);
        break;
      case 'coupledBranch': {
        const m = e.from.length;
        const y = asm.coupledY.get(k)!;
        const list: Cx[] = [];
        for (let i = 0; i < m; i++) {
          let ir = 0;
          let ii = 0;
          for (let j = 0; j < m; j++) {
            const dr = vRe[nodes[j]] - vRe[nodes[m + j]];
            const di = vIm[nodes[j]] - vIm[nodes[m + j]];
            const yr = y.re[i * m + j];
            const yi = y.im[i * m + j];
            ir += yr * dr - yi * di;
            ii += yr * di + yi * dr;
          }
          list.push({ re: ir, im: ii });
          out(nodes[i], ir, ii);
          out(nodes[m + i], -ir, -ii);
        }
        currents.set(e.id, list);
        break;
      }
      case 'admittanceMatrix': {
        const m = e.nodes.length;
        const list: Cx[] = [];
        for (let i = 0; i < m; i++) {
          let ir = 0;
          let ii = 0;
          for (let j = 0; j < m; j++) {
            const y = e.siemens[i][j];
            ir += y.re * vRe[nodes[j]] - y.im * vIm[nodes[j]];
            ii += y.re * vIm[nodes[j]] + y.im * vRe[nodes[j]];
          }
          list.push({ re: ir, im: ii });
          out(nodes[i], ir, ii);
        }
        currents.set(e.id, list);
        break;
      }
      case 'zipLoad': {
        const [ir, ii] = zipCurrent(e, vRe[nodes[0]] - vRe[nodes[1]], vIm[nodes[0]] - vIm[nodes[1]], lowPu);
        currents.set(e.id, [{ re: ir, im: ii }]);
        out(nodes[0], ir, ii);
        out(nodes[1], -ir, -ii);
        break;
      }
    }
  }
  // Ideal elements: KCL leaf to root along each zero-impedance tree. F = net current leaving a
  // subtree into the other elements; the edge to the parent brings exactly F into the subtree.
  const fRe = Float64Array.from(oRe);
  const fIm = Float64Array.from(oIm);
  const edgeCurrent = new Map<number, Cx>();
  const order = t.treeOrder;
  let maxKcl = 0;
  for (let q = order.length - 1; q >= 0; q--) {
    const c = order[q];
    const p = t.treeParent[c];
    const el = t.treeEdge[c];
    const Fr = fRe[c];
    const Fi = fIm[c];
    fRe[p] += Fr;
    fIm[p] += Fi;
    if (el < 0) {
      // virtual edge of a floating island's reference: its current is the island's KCL residual
      maxKcl = Math.max(maxKcl, Math.hypot(Fr, Fi));
      continue;
    }
    const e = prims[el];
    let sign: number; // current in the element's convention = sign × (current from parent into child)
    if (e.type === 'switch') sign = t.elNodes[el][1] === c ? 1 : -1; // from parent to child = from → to
    else sign = t.elNodes[el][0] === c ? 1 : -1; // source: current leaving plus = current arriving at plus
    edgeCurrent.set(el, { re: sign * Fr, im: sign * Fi });
  }
  for (const k of treeEls) currents.set(prims[k].id, [edgeCurrent.get(k) ?? { re: 0, im: 0 }]);
  // KCL residual: nodes off the trees and the roots of trees other than earth's
  for (let i = 1; i < nn; i++) {
    if (t.treeParent[i] !== -1) continue;
    if (t.unknownOf[i] < 0) continue; // earth-tree root is earth itself; earth is not checked
    maxKcl = Math.max(maxKcl, Math.hypot(fRe[i], fIm[i]));
  }
  // Recompute from the element currents as an independent self-check (KCL at every node but earth).
  const chkRe = new Float64Array(nn);
  const chkIm = new Float64Array(nn);
  for (let k = 0; k < prims.length; k++) {
    const e = prims[k];
    const list = currents.get(e.id)!;
    const nodes = t.elNodes[k];
    const add = (i: number, c: Cx, s: number) => {
      chkRe[i] += s * c.re;
      chkIm[i] += s * c.im;
    };
    switch (e.type) {
      case 'voltageSource':
        add(nodes[0], list[0], -1);
        add(nodes[1], list[0], 1);
        break;
      case 'coupledBranch': {
        const m = e.from.length;
        for (let i = 0; i < m; i++) {
          add(nodes[i], list[i], 1);
          add(nodes[m + i], list[i], -1);
        }
        break;
      }
      case 'admittanceMatrix':
        for (let i = 0; i < nodes.length; i++) add(nodes[i], list[i], 1);
        break;
      default:
        add(nodes[0], list[0], 1);
        add(nodes[1], list[0], -1);
    }
  }
  for (let i = 1; i < nn; i++) maxKcl = Math.max(maxKcl, Math.hypot(chkRe[i], chkIm[i]));
  return { currents, maxKcl };
}
