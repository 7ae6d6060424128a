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
 *
 * Voltage-dependent (zip) loads: the matrix carries each load's admittance at rated voltage
 * y0 = conj(S)/Vr² (one factorization per solve). First the chord (fixed-slope current-injection)
 * iteration, each step injecting the difference between the load's law I(V) and y0·V at the last
 * voltages (linear convergence, one substitution per step: enough for most networks). If it has
 * not converged within 40 steps, and there are at most NEWTON_MAX_LOADS such loads, Newton on
 * the loads' terminal voltages (./zip-newton.ts: the network reduced to an m × m complex matrix
 * G = Eᵀ·M⁻¹·E by one substitution per load, and a real 2m × 2m Jacobian, since a constant-power
 * load's current depends on conj(V)); if Newton stalls, continuation from the rated impedances to
 * the laws, then a start on the low-voltage branch; only if all fail, a VoltageCollapseError with
 * the nose of the load level found by continuation. Beyond NEWTON_MAX_LOADS: the chord
 * iteration alone. Converged when the largest change of a zip load's terminal voltage is below `tolerance` per
 * unit of its ratedVolts (default 1e-9) within `maxIterations` (default 100); otherwise a
 * NonConvergenceError names the load with the largest power mismatch.
 * Below `lowVoltagePu` (default 0.7) the constant-current and constant-power parts become the
 * constant impedances they have at that voltage (continuous there): common practice, and it
 * makes a solution exist however heavy the load (the low-voltage branch).
 *
 * Element values are compiled into typed arrays once per `update` (inputs arrive as objects of
 * many shapes, whose property reads are slow in V8); assembly, factorization and current recovery
 * then touch typed arrays only.
 */
import { IllPosedNetworkError, InvalidCircuitError, NonConvergenceError, SingularNetworkError, VoltageCollapseError } from '../errors.ts';
import type { Cx, FloatingIsland, LowVoltageLoad, Primitive, PrimitiveSolution, SolveOptions } from '../types.ts';
import { EARTH } from '../types.ts';
import { denseInverseInto } from './dense.ts';
import { analyzePattern, createLuWorkspace, factorNumeric, type LuWorkspace, type NumericLu, type SymbolicLu } from './sparse-lu.ts';
import { LazyMap } from './lazy-map.ts';
import { validatePrimitives } from './validate.ts';
import { zipContinuation, zipNewton, type ZipReduced } from './zip-newton.ts';

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
   * network is re-analysed transparently. `changed` (sweeps): the positions whose primitive may
   * differ from the last update's; every other position must hold the very same object as then.
   */
  update(primitives: readonly Primitive[], changed?: readonly number[]): void;
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

/**
 * The typed arrays behind a solution's Maps (node voltages by node number, currents flat per
 * element), for readers that walk every value once in order (the CLI's printed-only output):
 * they skip building the Maps' ~10⁵ small objects. Read-only; the same numbers as the Maps.
 */
export interface SolutionArrays {
  /** Node names by node number (earth first), and the inverse. */
  nodeNames: readonly string[];
  nodeIndex: ReadonlyMap<string, number>;
  vRe: Float64Array;
  vIm: Float64Array;
  /** Primitive ids in solver order; the currents of primitive k are at currentOffset[k] … currentOffset[k + 1] − 1. */
  elementIds: readonly string[];
  currentOffset: Int32Array;
  cRe: Float64Array;
  cIm: Float64Array;
}

const SOLUTION_ARRAYS = new WeakMap<PrimitiveSolution, SolutionArrays>();

/** The arrays behind a solution returned by this solver (undefined for any other object). */
export const solutionArrays = (sol: PrimitiveSolution): SolutionArrays | undefined => SOLUTION_ARRAYS.get(sol);

const now = (): number => (typeof performance !== 'undefined' ? performance.now() : Date.now());

/** Solve a network of primitives once (conventions in types.ts). Throws the typed errors of errors.ts. */
export function solvePrimitives(primitives: readonly Primitive[], options?: SolverOptions): PrimitiveSolution {
  return createNetwork(primitives).solve(options);
}

/** Prepare a network for repeated solves; the symbolic analysis (ordering, fill pattern) is cached per topology. */
export function createNetwork(primitives: readonly Primitive[]): Network {
  validatePrimitives(primitives);
  let t0 = now();
  let topo = buildTopology(primitives.slice());
  let analyzeMs = now() - t0;
  let timings: SolveTimings = { analyzeMs, assembleMs: 0, factorMs: 0, solveMs: 0, totalMs: 0 };
  let broken: unknown = null;
  return {
    get size() {
      return topo.nUnknowns;
    },
    get factorNonZeros() {
      return 2 * topo.symbolic.lnz;
    },
    update(next, changed) {
      // only the changed primitives are checked again (the rest were, and ids stay unique when
      // theirs do not change: sameTopology compares them); a problem is reported as a full check words it
      const only = changed && next.length === topo.prims.length ? changed : undefined;
      if (only) {
        try {
          validatePrimitives(only.map((k) => next[k]));
        } catch {
          validatePrimitives(next);
        }
      } else validatePrimitives(next);
      const copy = next.slice();
      if (!sameTopology(topo, copy, only)) {
        t0 = now();
        topo = buildTopology(copy);
        analyzeMs = now() - t0;
      } else {
        try {
          loadValues(topo, copy, only);
        } catch (e) {
          // values half-loaded: force a rebuild on the next update, refuse to solve until then
          topo.prims = [];
          broken = e;
          throw e;
        }
        topo.prims = copy;
      }
      broken = null;
    },
    solve(options) {
      if (broken) throw broken;
      const r = solveTopology(topo, options ?? {}, analyzeMs);
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
  /** Element ids, kind codes (K_…), closed state of switches, and values compiled into typed arrays. */
  ids: string[];
  kind: Uint8Array;
  switchClosed: Uint8Array;
  values: Values;
  /** Coupled branches: offset of each element's n×n block (−1 for other kinds), its Z as last inverted, Y = Z⁻¹, validity. */
  coupledOffset: Int32Array;
  cz: { re: Float64Array; im: Float64Array };
  cy: { re: Float64Array; im: Float64Array };
  coupledValid: Uint8Array;
  /** Per element: offset of its first current in the flat current arrays (length elements + 1). */
  currentOffset: Int32Array;
  /**
   * Per element: 1 when every node it touches is its own unknown (not tied to earth, not inside a
   * zero-impedance tree), so each of its matrix entries is recorded and none touches the right-hand
   * side: value assembly then writes straight to the recorded positions (fast path, same order).
   */
  plainNodes: Uint8Array;
  /** Value assembler and LU workspace, created on the first solve and reused. */
  valueAssembler?: Assembler;
  workspace?: LuWorkspace;
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

const EMPTY_ADJ: { to: number; el: number }[] = [];

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

function sameTopology(t: Topology, prims: Primitive[], only?: readonly number[]): boolean {
  const old = t.prims;
  if (old.length !== prims.length) return false;
  for (let q = 0, end = only ? only.length : prims.length; q < end; q++) {
    const k = only ? only[q] : q;
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
  // adjacency of the zero-impedance forest, allocated only for the nodes it touches
  const fAdj: { to: number; el: number }[][] = new Array(nn).fill(EMPTY_ADJ);
  const adjOf = (i: number) => (fAdj[i] === EMPTY_ADJ ? (fAdj[i] = []) : fAdj[i]);
  for (let k = 0; k < prims.length; k++) {
    const e = prims[k];
    const zeroImpedance = (e.type === 'switch' && e.closed) || isIdealSource(e);
    if (!zeroImpedance) continue;
    const [a, b] = elNodes[k];
    if (!zdsu.union(a, b)) throw zeroImpedanceLoopError(prims, k, forestPath(fAdj, a, b));
    adjOf(a).push({ to: b, el: k });
    adjOf(b).push({ to: a, el: k });
  }

  // 2. Galvanic components and floating islands.
  const dsu = new Dsu(nn);
  const stampSignature = new Map<number, string>();
  for (let k = 0; k < prims.length; k++) {
    const e = prims[k];
    const nodes = elNodes[k];
    switch (e.type) {
      case 'impedance':
      case 'voltageSource':
      case 'zipLoad':
        dsu.union(nodes[0], nodes[1]);
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
    adjOf(r).push({ to: 0, el: VIRTUAL });
    adjOf(0).push({ to: r, el: VIRTUAL });
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
    ...coupledStorage(prims),
    ids: prims.map((e) => e.id),
    kind: Uint8Array.from(prims, kindCode),
    switchClosed: Uint8Array.from(prims, (e) => (e.type === 'switch' && e.closed ? 1 : 0)),
    values: allocValues(prims),
    currentOffset: currentOffsets(elNodes, prims),
    plainNodes: plainNodeFlags(elNodes, unknownOf, treeParent),
  };
  loadValues(topo, prims);

  // 4. Pattern pass: record the matrix entries the stamps touch, then the symbolic analysis.
  const rec: Recorder = { rows: new Int32Array(1024), cols: new Int32Array(1024), count: 0 };
  const asm = makeAssembler(topo, nUnknowns, rec, null);
  asm.stampAll();
  const { symbolic, positions } = analyzePattern(nUnknowns, rec.rows, rec.cols, rec.count);
  topo.symbolic = symbolic;
  topo.positions = positions;
  return topo;
}

/** Elements whose nodes are all free unknowns (see Topology.plainNodes). */
function plainNodeFlags(elNodes: Int32Array[], unknownOf: Int32Array, treeParent: Int32Array): Uint8Array {
  const flags = new Uint8Array(elNodes.length);
  for (let k = 0; k < elNodes.length; k++) {
    let plain = 1;
    for (const i of elNodes[k]) if (unknownOf[i] < 0 || treeParent[i] !== -1) plain = 0;
    flags[k] = plain;
  }
  return flags;
}

/** Offsets of each element's currents in the flat arrays: coupled branches one per conductor, stamps one per node, others one. */
function currentOffsets(elNodes: Int32Array[], prims: Primitive[]): Int32Array {
  const off = new Int32Array(prims.length + 1);
  for (let k = 0; k < prims.length; k++) {
    const t = prims[k].type;
    off[k + 1] = off[k] + (t === 'coupledBranch' ? elNodes[k].length >> 1 : t === 'admittanceMatrix' ? elNodes[k].length : 1);
  }
  return off;
}

function coupledStorage(prims: Primitive[]) {
  const coupledOffset = new Int32Array(prims.length).fill(-1);
  let total = 0;
  for (let k = 0; k < prims.length; k++) {
    const e = prims[k];
    if (e.type !== 'coupledBranch') continue;
    coupledOffset[k] = total;
    total += e.from.length * e.from.length;
  }
  return {
    coupledOffset,
    cz: { re: new Float64Array(total), im: new Float64Array(total) },
    cy: { re: new Float64Array(total), im: new Float64Array(total) },
    coupledValid: new Uint8Array(prims.length),
  };
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
  // EMF around the loop: walk it from the closing element's first terminal, through that element, and back along the forest path.
  let emf = { re: 0, im: 0 };
  const closingEl = prims[closing];
  const ends = elementNodes(closingEl);
  const walk = [closing, ...path.slice().reverse()];
  // orient every element along the walk: closing goes ends[0] → ends[1], then path back to ends[0]
  let at = ends[0];
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
// Element values, compiled into typed arrays once per `update` (the input objects come in many
// shapes, and reading them in every solve was a measurable cost: property reads on objects of
// mixed shapes are slow in V8; typed arrays are not).

const K_IMPEDANCE = 0;
const K_SOURCE_Z = 1;
const K_SOURCE_IDEAL = 2;
const K_CURRENT = 3;
const K_COUPLED = 4;
const K_SWITCH = 5;
const K_ADMITTANCE = 6;
const K_ZIP = 7;

/** Per-element values in typed arrays (meaning per kind in the comments). */
interface Values {
  /** impedance: 1/Z; source with series impedance: 1/Zs; zip load: y0 = conj(S)/Vr² (siemens). */
  yRe: Float64Array;
  yIm: Float64Array;
  /** source: EMF (V); current source: amps (A); zip load: ratedVA (VA). */
  sRe: Float64Array;
  sIm: Float64Array;
  /** zip load: ratedVolts and the z, i, p fractions. */
  zipVolts: Float64Array;
  zipZ: Float64Array;
  zipI: Float64Array;
  zipP: Float64Array;
  /** admittance stamps: offset of each n×n block, and the values. */
  stampOffset: Int32Array;
  stampRe: Float64Array;
  stampIm: Float64Array;
}

function kindCode(e: Primitive): number {
  switch (e.type) {
    case 'impedance':
      return K_IMPEDANCE;
    case 'voltageSource':
      return isIdealSource(e) ? K_SOURCE_IDEAL : K_SOURCE_Z;
    case 'currentSource':
      return K_CURRENT;
    case 'coupledBranch':
      return K_COUPLED;
    case 'switch':
      return K_SWITCH;
    case 'admittanceMatrix':
      return K_ADMITTANCE;
    case 'zipLoad':
      return K_ZIP;
  }
}

function allocValues(prims: Primitive[]): Values {
  const n = prims.length;
  const stampOffset = new Int32Array(n).fill(-1);
  let total = 0;
  for (let k = 0; k < n; k++) {
    const e = prims[k];
    if (e.type !== 'admittanceMatrix') continue;
    stampOffset[k] = total;
    total += e.nodes.length * e.nodes.length;
  }
  return {
    yRe: new Float64Array(n),
    yIm: new Float64Array(n),
    sRe: new Float64Array(n),
    sIm: new Float64Array(n),
    zipVolts: new Float64Array(n),
    zipZ: new Float64Array(n),
    zipI: new Float64Array(n),
    zipP: new Float64Array(n),
    stampOffset,
    stampRe: new Float64Array(total),
    stampIm: new Float64Array(total),
  };
}

/** Read the element values into the topology's typed arrays (coupled-branch inverses are refreshed only where Z changed); `only`: just those positions. */
function loadValues(t: Topology, prims: Primitive[], only?: readonly number[]): void {
  const v = t.values;
  for (let q = 0, end = only ? only.length : prims.length; q < end; q++) {
    const k = only ? only[q] : q;
    const e = prims[k];
    switch (e.type) {
      case 'impedance': {
        const d = e.ohms.re * e.ohms.re + e.ohms.im * e.ohms.im;
        v.yRe[k] = e.ohms.re / d;
        v.yIm[k] = -e.ohms.im / d;
        break;
      }
      case 'voltageSource': {
        v.sRe[k] = e.volts.re;
        v.sIm[k] = e.volts.im;
        if (t.kind[k] === K_SOURCE_Z) {
          const z = e.seriesOhms!;
          const d = z.re * z.re + z.im * z.im;
          v.yRe[k] = z.re / d;
          v.yIm[k] = -z.im / d;
        }
        break;
      }
      case 'currentSource':
        v.sRe[k] = e.amps.re;
        v.sIm[k] = e.amps.im;
        break;
      case 'coupledBranch': {
        const m = e.from.length;
        const o = t.coupledOffset[k];
        if (t.coupledValid[k] && sameMatrix(t.cz.re, t.cz.im, o, e.ohms)) break;
        for (let i = 0; i < m; i++)
          for (let j = 0; j < m; j++) {
            t.cz.re[o + i * m + j] = e.ohms[i][j].re;
            t.cz.im[o + i * m + j] = e.ohms[i][j].im;
          }
        t.coupledValid[k] = 0;
        if (!denseInverseInto(m, t.cz.re, t.cz.im, o, t.cy.re, t.cy.im, o))
          throw new InvalidCircuitError(
            `Invalid circuit: coupled branch '${e.id}' has a singular impedance matrix (a conductor with zero impedance?); use switches for direct connections`,
            [{ path: `elements[${k}].ohms`, message: 'singular impedance matrix' }],
            { elementIds: [e.id] },
          );
        t.coupledValid[k] = 1;
        break;
      }
      case 'admittanceMatrix': {
        const m = e.nodes.length;
        const o = v.stampOffset[k];
        for (let i = 0; i < m; i++)
          for (let j = 0; j < m; j++) {
            v.stampRe[o + i * m + j] = e.siemens[i][j].re;
            v.stampIm[o + i * m + j] = e.siemens[i][j].im;
          }
        break;
      }
      case 'zipLoad': {
        const v2 = e.ratedVolts * e.ratedVolts;
        v.sRe[k] = e.ratedVA.re;
        v.sIm[k] = e.ratedVA.im;
        v.yRe[k] = e.ratedVA.re / v2;
        v.yIm[k] = -e.ratedVA.im / v2;
        v.zipVolts[k] = e.ratedVolts;
        v.zipZ[k] = e.zip.z;
        v.zipI[k] = e.zip.i;
        v.zipP[k] = e.zip.p;
        break;
      }
      case 'switch':
        break;
    }
  }
}

function sameMatrix(re: Float64Array, im: Float64Array, off: number, z: Cx[][]): boolean {
  const m = z.length;
  for (let i = 0; i < m; i++) {
    const row = z[i];
    for (let j = 0; j < m; j++) if (row[j].re !== re[off + i * m + j] || row[j].im !== im[off + i * m + j]) return false;
  }
  return true;
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
  stampAll(): void;
}

/** Matrix entries recorded by the pattern pass (growable typed arrays). */
interface Recorder {
  rows: Int32Array;
  cols: Int32Array;
  count: number;
}

function makeAssembler(t: Topology, n: number, rec: Recorder | null, values: { nnz: number } | null): Assembler {
  const nn = t.nodeNames.length;
  const unknownOf = t.unknownOf;
  const offRe = new Float64Array(nn);
  const offIm = new Float64Array(nn);
  const rhsRe = new Float64Array(n);
  const rhsIm = new Float64Array(n);
  const aRe = new Float64Array(values ? values.nnz : 0);
  const aIm = new Float64Array(values ? values.nnz : 0);
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
      if (rec.count === rec.rows.length) {
        const r2 = new Int32Array(rec.count * 2);
        r2.set(rec.rows);
        rec.rows = r2;
        const c2 = new Int32Array(rec.count * 2);
        c2.set(rec.cols);
        rec.cols = c2;
      }
      rec.rows[rec.count] = ur;
      rec.cols[rec.count++] = uc;
    } else {
      const p = t.positions[cursor++];
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

  const stampAll = (): void => {
    const v = t.values;
    const kind = t.kind;
    const plain = t.plainNodes;
    const positions = t.positions;
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
      const sg = t.treeSign[c];
      if (sg !== 0) {
        const el = t.treeEdge[c];
        re += sg * v.sRe[el];
        im += sg * v.sIm[el];
      }
      offRe[c] = re;
      offIm[c] = im;
    }
    for (let k = 0; k < kind.length; k++) {
      const nodes = t.elNodes[k];
      switch (kind[k]) {
        case K_IMPEDANCE:
        case K_ZIP: // the whole rated power as an admittance in the matrix; the rest is a correcting injection
          if (!rec && plain[k]) {
            // fast path: branch()'s four entries (aa, bb, ab, ba) straight to their positions
            const yr = v.yRe[k];
            const yi = v.yIm[k];
            let p = positions[cursor++];
            aRe[p] += yr;
            aIm[p] += yi;
            p = positions[cursor++];
            aRe[p] += yr;
            aIm[p] += yi;
            p = positions[cursor++];
            aRe[p] -= yr;
            aIm[p] -= yi;
            p = positions[cursor++];
            aRe[p] -= yr;
            aIm[p] -= yi;
            break;
          }
          branch(nodes[0], nodes[1], v.yRe[k], v.yIm[k]);
          break;
        case K_SOURCE_Z: {
          const yr = v.yRe[k];
          const yi = v.yIm[k];
          branch(nodes[0], nodes[1], yr, yi);
          // Norton equivalent: E/Zs injected into plus, drawn from minus
          const jr = v.sRe[k] * yr - v.sIm[k] * yi;
          const ji = v.sRe[k] * yi + v.sIm[k] * yr;
          inject(nodes[0], jr, ji);
          inject(nodes[1], -jr, -ji);
          break;
        }
        case K_CURRENT:
          inject(nodes[1], v.sRe[k], v.sIm[k]);
          inject(nodes[0], -v.sRe[k], -v.sIm[k]);
          break;
        case K_COUPLED: {
          const m = nodes.length >> 1;
          const o = t.coupledOffset[k];
          const yRe = t.cy.re;
          const yIm = t.cy.im;
          if (!rec && plain[k]) {
            // fast path: the same entries in the same order as the loop below, straight to their positions
            for (let i = 0; i < m; i++)
              for (let j = 0; j < m; j++) {
                const yr = yRe[o + i * m + j];
                const yi = yIm[o + i * m + j];
                let p = positions[cursor++];
                aRe[p] += yr;
                aIm[p] += yi;
                p = positions[cursor++];
                aRe[p] += yr;
                aIm[p] += yi;
                p = positions[cursor++];
                aRe[p] -= yr;
                aIm[p] -= yi;
                p = positions[cursor++];
                aRe[p] -= yr;
                aIm[p] -= yi;
              }
            break;
          }
          for (let i = 0; i < m; i++)
            for (let j = 0; j < m; j++) {
              const yr = yRe[o + i * m + j];
              const yi = yIm[o + i * m + j];
              entry(nodes[i], nodes[j], yr, yi);
              entry(nodes[m + i], nodes[m + j], yr, yi);
              entry(nodes[i], nodes[m + j], -yr, -yi);
              entry(nodes[m + i], nodes[j], -yr, -yi);
            }
          break;
        }
        case K_ADMITTANCE: {
          const m = nodes.length;
          const o = v.stampOffset[k];
          for (let i = 0; i < m; i++) for (let j = 0; j < m; j++) entry(nodes[i], nodes[j], v.stampRe[o + i * m + j], v.stampIm[o + i * m + j]);
          break;
        }
        default: // ideal sources and switches: folded into the supernodes
          break;
      }
    }
  };
  return { offRe, offIm, rhsRe, rhsIm, aRe, aIm, stampAll };
}

// ---------------------------------------------------------------------------------------------
// Solve: factor, iterate voltage-dependent loads, recover currents.

/** Scratch for zipCurrent's result (re, im), to keep the inner loops free of allocation. */
const ZC = new Float64Array(2);

/** Current drawn by zip load k (from → to) at terminal voltage V = vr + j·vi, with the low-voltage rule; result in ZC. */
function zipCurrent(v: Values, k: number, vr: number, vi: number, lowPu: number): void {
  const vrated = v.zipVolts[k];
  const m2 = vr * vr + vi * vi;
  const m = Math.sqrt(m2);
  const pu = m / vrated;
  // I = g·V with g = conj(S)·f, f summing the parts: z/Vr², i/(Vr·|V|), p/|V|²
  let f = v.zipZ[k] / (vrated * vrated);
  if (pu >= lowPu && m > 0) {
    f += v.zipI[k] / (vrated * m) + v.zipP[k] / m2;
  } else {
    f += v.zipI[k] / (lowPu * vrated * vrated) + v.zipP[k] / (lowPu * lowPu * vrated * vrated);
  }
  const gr = v.sRe[k] * f;
  const gi = -v.sIm[k] * f;
  ZC[0] = gr * vr - gi * vi;
  ZC[1] = gr * vi + gi * vr;
}

/**
 * Law of zip load k for Newton (./zip-newton.ts): into out [I, ∂I (real 2×2), y0].
 * I = conj(S)·f(|u|)·u with f as in zipCurrent; ∂I = conj(S)·[f·∂u + u·f'(|u|)·∂|u|],
 * ∂|u| = (u_re·∂u_re + u_im·∂u_im)/|u|. `forceLow` applies the low-voltage impedance at any voltage.
 */
function zipLaw(v: Values, k: number, ur: number, ui: number, lowPu: number, forceLow: boolean, out: Float64Array): void {
  const vrated = v.zipVolts[k];
  const m2 = ur * ur + ui * ui;
  const m = Math.sqrt(m2);
  let f = v.zipZ[k] / (vrated * vrated);
  let fp = 0;
  if (!forceLow && m / vrated >= lowPu && m > 0) {
    f += v.zipI[k] / (vrated * m) + v.zipP[k] / m2;
    fp = -v.zipI[k] / (vrated * m2) - (2 * v.zipP[k]) / (m2 * m);
  } else {
    f += v.zipI[k] / (lowPu * vrated * vrated) + v.zipP[k] / (lowPu * lowPu * vrated * vrated);
  }
  const hr = v.sRe[k];
  const hi = -v.sIm[k];
  const gr = hr * f;
  const gi = hi * f;
  out[0] = gr * ur - gi * ui;
  out[1] = gr * ui + gi * ur;
  // q = conj(S)·u·f'/|u|
  const s = m > 0 ? fp / m : 0;
  const qr = (hr * ur - hi * ui) * s;
  const qi = (hr * ui + hi * ur) * s;
  out[2] = gr + qr * ur;
  out[3] = -gi + qr * ui;
  out[4] = gi + qi * ur;
  out[5] = gr + qi * ui;
  out[6] = v.yRe[k];
  out[7] = v.yIm[k];
}

/** Loads up to this count go on to Newton (dense m × m reduction) when the chord iteration has not converged. */
export const NEWTON_MAX_LOADS = 400;
/** Chord iterations tried before Newton. */
const CHORD_FIRST = 40;

function solveTopology(t: Topology, options: SolverOptions, analyzeMs: number): { solution: PrimitiveSolution; timings: SolveTimings } {
  const tStart = now();
  const tol = options.tolerance ?? DEFAULT_TOLERANCE;
  const maxIter = options.maxIterations ?? DEFAULT_MAX_ITERATIONS;
  const lowPu = options.lowVoltagePu ?? DEFAULT_LOW_VOLTAGE_PU;
  if (!(tol > 0) || !Number.isFinite(tol)) throw new InvalidCircuitError(`Invalid solve options: tolerance must be a positive number (got ${tol})`);
  if (!Number.isInteger(maxIter) || maxIter < 1) throw new InvalidCircuitError(`Invalid solve options: maxIterations must be a positive integer (got ${maxIter})`);
  if (!(lowPu > 0 && lowPu <= 1)) throw new InvalidCircuitError(`Invalid solve options: lowVoltagePu must be in (0, 1] (got ${lowPu})`);

  checkCurrentSourceCutSets(t);

  const n = t.nUnknowns;
  const s = t.symbolic;
  const v = t.values;
  // the value assembler and the LU workspace are kept per topology (no reallocation between solves)
  const asm = (t.valueAssembler ??= makeAssembler(t, n, null, { nnz: s.rowIdx.length }));
  asm.stampAll();
  const tAsm = now();
  const lu = factorNumeric(s, asm.aRe, asm.aIm, undefined, undefined, (t.workspace ??= createLuWorkspace(s)));
  const tFac = now();

  const nn = t.nodeNames.length;
  const vRe = new Float64Array(nn);
  const vIm = new Float64Array(nn);
  const unknownOf = t.unknownOf;
  const setVoltages = (x: { re: Float64Array; im: Float64Array }) => {
    for (let i = 0; i < nn; i++) {
      const u = unknownOf[i];
      vRe[i] = asm.offRe[i] + (u >= 0 ? x.re[u] : 0);
      vIm[i] = asm.offIm[i] + (u >= 0 ? x.im[u] : 0);
    }
  };

  const zipIdx: number[] = [];
  for (let k = 0; k < t.kind.length; k++) if (t.kind[k] === K_ZIP && v.zipZ[k] !== 1) zipIdx.push(k);

  let iterations = 1;
  let x = lu.solve(asm.rhsRe, asm.rhsIm);
  checkFinite(x, t);
  setVoltages(x);
  if (zipIdx.length > 0) {
    const nz = zipIdx.length;
    // the chord iteration first (cheap, and enough for most networks); Newton when it has not
    // converged within CHORD_FIRST iterations and the loads are few enough for it
    const useNewton = nz <= NEWTON_MAX_LOADS;
    const chordLimit = useNewton ? Math.min(maxIter, CHORD_FIRST) : maxIter;
    const u0Re = new Float64Array(nz);
    const u0Im = new Float64Array(nz);
    const prevRe = new Float64Array(nz);
    const prevIm = new Float64Array(nz);
    const corrRe = new Float64Array(nz);
    const corrIm = new Float64Array(nz);
    const bRe = new Float64Array(n);
    const bIm = new Float64Array(n);
    for (let a = 0; a < nz; a++) {
      const nodes = t.elNodes[zipIdx[a]];
      prevRe[a] = u0Re[a] = vRe[nodes[0]] - vRe[nodes[1]];
      prevIm[a] = u0Im[a] = vIm[nodes[0]] - vIm[nodes[1]];
    }
    let converged = false;
    const lastChange = new Float64Array(nz);
    while (iterations < chordLimit) {
      // Chord iteration (current injection): the matrix holds y0 = conj(S)/Vr² for each load, and
      // the correction c = I(V) − y0·V at the last voltages is injected as −c at `from`, +c at `to`.
      bRe.set(asm.rhsRe);
      bIm.set(asm.rhsIm);
      for (let a = 0; a < nz; a++) {
        const k = zipIdx[a];
        const vr = prevRe[a];
        const vi = prevIm[a];
        zipCurrent(v, k, vr, vi, lowPu);
        corrRe[a] = ZC[0] - (v.yRe[k] * vr - v.yIm[k] * vi);
        corrIm[a] = ZC[1] - (v.yRe[k] * vi + v.yIm[k] * vr);
        const nodes = t.elNodes[k];
        const uf = unknownOf[nodes[0]];
        const ut = unknownOf[nodes[1]];
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
        const nodes = t.elNodes[zipIdx[a]];
        const vr = vRe[nodes[0]] - vRe[nodes[1]];
        const vi = vIm[nodes[0]] - vIm[nodes[1]];
        const ch = Math.hypot(vr - prevRe[a], vi - prevIm[a]) / v.zipVolts[zipIdx[a]];
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
    if (!converged && useNewton && iterations < maxIter) {
      iterations += solveZipByNewton(t, lu, asm, zipIdx, u0Re, u0Im, setVoltages, vRe, vIm, tol, maxIter - iterations, lowPu);
      converged = true;
    }
    if (!converged) throw nonConvergence(t, zipIdx, vRe, vIm, corrRe, corrIm, lastChange, iterations, lowPu);
  }
  const tSol = now();

  const { cRe, cIm, maxKcl, lowVoltage } = elementCurrents(t, vRe, vIm, lowPu);
  // A numerically floating part (found by the LU border) cannot take a net current: if KCL fails,
  // something drives current into it with no way back.
  if (lu.nullVectors.length > 0 && maxKcl > 1e-9 * Math.max(largestCurrent(cRe, cIm), admittanceScale(t) * largestVoltage(vRe, vIm), 1e-12)) {
    const isl = numericIslands(t, lu);
    const nodes = isl.flatMap((i) => i.nodes);
    throw new IllPosedNetworkError(
      `A net current of ${+maxKcl.toPrecision(4)} A is driven into the floating part ${nodes
        .slice(0, 6)
        .map((x) => `'${x}'`)
        .join(', ')}${nodes.length > 6 ? ', …' : ''}, which is coupled to the rest only magnetically (admittance stamps): the current has nowhere to flow.`,
      { nodes },
    );
  }
  // The Maps of the solution are built on first use from these arrays (building ~10⁵ small
  // objects per solve was most of a warm 20 000-bus solve; live re-solving often reads few of them).
  const nodeNames = t.nodeNames;
  const nodeVolts = new LazyMap<string, Cx>((set) => {
    for (let i = 0; i < nn; i++) set(nodeNames[i], { re: vRe[i], im: vIm[i] });
  });
  const ids = t.ids;
  const off = t.currentOffset;
  const currents = new LazyMap<string, Cx[]>((set) => {
    for (let k = 0; k < ids.length; k++) {
      const list: Cx[] = new Array(off[k + 1] - off[k]);
      for (let j = off[k]; j < off[k + 1]; j++) list[j - off[k]] = { re: cRe[j], im: cIm[j] };
      set(ids[k], list);
    }
  });
  const floating: FloatingIsland[] = t.islands.map((i) => ({ nodes: i.island.nodes.slice(), referenceNode: i.island.referenceNode }));
  floating.push(...numericIslands(t, lu));
  const tEnd = now();
  const solution: PrimitiveSolution = { nodeVolts, elementCurrents: currents, floating, iterations, maxKclResidualAmps: maxKcl, lowVoltageLoads: lowVoltage };
  SOLUTION_ARRAYS.set(solution, { nodeNames, nodeIndex: t.nodeIndex, vRe, vIm, elementIds: ids, currentOffset: off, cRe, cIm });
  return {
    solution,
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
function checkCurrentSourceCutSets(t: Topology): void {
  const v = t.values;
  for (const isl of t.islands) {
    if (isl.currentSources.length === 0) continue;
    const inside = new Set(isl.nodeSet);
    let re = 0;
    let im = 0;
    let scale = 0;
    for (const k of isl.currentSources) {
      const [a, b] = t.elNodes[k];
      const sgn = (inside.has(b) ? 1 : 0) - (inside.has(a) ? 1 : 0);
      re += sgn * v.sRe[k];
      im += sgn * v.sIm[k];
      scale = Math.max(scale, Math.hypot(v.sRe[k], v.sIm[k]));
    }
    if (Math.hypot(re, im) > 1e-12 * scale && scale > 0) {
      const ids = isl.currentSources.map((k) => t.ids[k]);
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

/**
 * Voltage-dependent loads by Newton on their terminal voltages (./zip-newton.ts), when the chord
 * iteration has not converged: directly from the plain solve (terminal voltages u0); if Newton stalls, by continuation in the load level and, past a nose, from the
 * low-voltage branch (every constant-current and constant-power part at its low-voltage impedance:
 * the documented rule makes a solution exist there). Leaves the node voltages in vRe/vIm and
 * returns the iteration count (linear solves of the reduced system).
 */
function solveZipByNewton(
  t: Topology,
  lu: NumericLu,
  asm: Assembler,
  zipIdx: number[],
  u0Re: Float64Array,
  u0Im: Float64Array,
  setVoltages: (x: { re: Float64Array; im: Float64Array }) => void,
  vRe: Float64Array,
  vIm: Float64Array,
  tol: number,
  maxIter: number,
  lowPu: number,
): number {
  const v = t.values;
  const n = t.nUnknowns;
  const m = zipIdx.length;
  const uf = new Int32Array(m);
  const ut = new Int32Array(m);
  const vRated = new Float64Array(m);
  for (let a = 0; a < m; a++) {
    const nodes = t.elNodes[zipIdx[a]];
    uf[a] = t.unknownOf[nodes[0]];
    ut[a] = t.unknownOf[nodes[1]];
    vRated[a] = v.zipVolts[zipIdx[a]];
  }
  // G = Eᵀ·M⁻¹·E: one solve per load
  const gRe = new Float64Array(m * m);
  const gIm = new Float64Array(m * m);
  const eRe = new Float64Array(n);
  const eIm = new Float64Array(n);
  for (let b = 0; b < m; b++) {
    eRe.fill(0);
    if (uf[b] >= 0) eRe[uf[b]] += 1;
    if (ut[b] >= 0) eRe[ut[b]] -= 1;
    const w = lu.solve(eRe, eIm);
    for (let a = 0; a < m; a++) {
      gRe[a * m + b] = (uf[a] >= 0 ? w.re[uf[a]] : 0) - (ut[a] >= 0 ? w.re[ut[a]] : 0);
      gIm[a * m + b] = (uf[a] >= 0 ? w.im[uf[a]] : 0) - (ut[a] >= 0 ? w.im[ut[a]] : 0);
    }
  }
  const reduced = (forceLow: boolean): ZipReduced => ({
    m,
    u0Re,
    u0Im,
    gRe,
    gIm,
    vRated,
    law: (a, ur, ui, out) => zipLaw(v, zipIdx[a], ur, ui, lowPu, forceLow, out),
  });
  const p = reduced(false);
  const law = new Float64Array(8);
  const corrRe = new Float64Array(m);
  const corrIm = new Float64Array(m);
  /** Node voltages from terminal voltages u: x = M⁻¹(b − E·c(u)). */
  const finish = (uRe: Float64Array, uIm: Float64Array) => {
    const bRe = Float64Array.from(asm.rhsRe);
    const bIm = Float64Array.from(asm.rhsIm);
    for (let a = 0; a < m; a++) {
      zipLaw(v, zipIdx[a], uRe[a], uIm[a], lowPu, false, law);
      // correction c = I(u) − y0·u (the matrix already holds y0)
      const cr = law[0] - (law[6] * uRe[a] - law[7] * uIm[a]);
      const ci = law[1] - (law[6] * uIm[a] + law[7] * uRe[a]);
      corrRe[a] = cr;
      corrIm[a] = ci;
      if (uf[a] >= 0) {
        bRe[uf[a]] -= cr;
        bIm[uf[a]] -= ci;
      }
      if (ut[a] >= 0) {
        bRe[ut[a]] += cr;
        bIm[ut[a]] += ci;
      }
    }
    const x = lu.solve(bRe, bIm);
    checkFinite(x, t);
    setVoltages(x);
  };
  const uRe = Float64Array.from(u0Re);
  const uIm = Float64Array.from(u0Im);
  const lastStep = new Float64Array(m);
  const direct = zipNewton(p, uRe, uIm, 1, 'blend', tol, maxIter, lastStep);
  let iterations = direct.iterations;
  if (direct.status === 'converged') {
    finish(uRe, uIm);
    return iterations;
  }
  if (direct.status === 'iteration-limit') {
    finish(uRe, uIm);
    throw nonConvergence(t, zipIdx, vRe, vIm, corrRe, corrIm, lastStep, iterations, lowPu);
  }
  // Newton stalled (a singular Jacobian, or no descent): morph the loads from their rated
  // impedance to their law, then, if that meets a fold, start from the low-voltage branch
  // (linear there: one step) and apply the true law.
  const blend = zipContinuation(p, 'blend', tol);
  iterations += blend.iterations;
  if (blend.lambda >= 1) {
    finish(blend.uRe, blend.uIm);
    return iterations;
  }
  const lowRe = Float64Array.from(u0Re);
  const lowIm = Float64Array.from(u0Im);
  iterations += zipNewton(reduced(true), lowRe, lowIm, 1, 'blend', tol, 5).iterations;
  const low = zipNewton(p, lowRe, lowIm, 1, 'blend', tol, Math.max(maxIter, 25));
  iterations += low.iterations;
  if (low.status === 'converged') {
    finish(lowRe, lowIm);
    return iterations;
  }
  // No solution found: the nose of the load level (loadability limit) for the report.
  const cont = zipContinuation(p, 'level', tol);
  const atNose = zipIdx
    .map((k, a) => ({ id: t.ids[k], pu: Math.hypot(cont.uRe[a], cont.uIm[a]) / vRated[a] }))
    .sort((x, y) => x.pu - y.pu);
  const named = atNose.slice(0, 3);
  finish(cont.uRe, cont.uIm);
  throw new VoltageCollapseError(
    `Voltage collapse: the voltage-dependent loads ask for more power than the network can deliver. Raising the loads from zero, a solution exists up to ${(cont.lambda * 100).toPrecision(4)} % of their rating (the nose point), where ${named
      .map((l) => `load '${l.id}' is at ${l.pu.toFixed(3)} pu`)
      .join(', ')}${atNose.length > 3 ? `, and ${atNose.length - 3} more` : ''}. Reduce these loads or strengthen the supply to them.`,
    cont.lambda,
    atNose,
    { elementIds: named.map((l) => l.id) },
  );
}

function nonConvergence(
  t: Topology,
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
  const v = t.values;
  let worst = 0;
  let worstVa = -1;
  const mismatch = new Float64Array(zipIdx.length);
  for (let a = 0; a < zipIdx.length; a++) {
    const k = zipIdx[a];
    const [f, to] = t.elNodes[k];
    const vr = vRe[f] - vRe[to];
    const vi = vIm[f] - vIm[to];
    zipCurrent(v, k, vr, vi, lowPu);
    const dr = v.yRe[k] * vr - v.yIm[k] * vi + corrRe[a] - ZC[0];
    const di = v.yRe[k] * vi + v.yIm[k] * vr + corrIm[a] - ZC[1];
    const va = Math.hypot(vr, vi) * Math.hypot(dr, di);
    mismatch[a] = Number.isFinite(va) ? va : Infinity;
    if (mismatch[a] > worstVa) {
      worstVa = mismatch[a];
      worst = a;
    }
  }
  const k = zipIdx[worst];
  const [f, to] = t.elNodes[k];
  const pu = Math.hypot(vRe[f] - vRe[to], vIm[f] - vIm[to]) / v.zipVolts[k];
  const puText = Number.isFinite(pu) ? `${pu.toFixed(3)} pu` : 'not finite';
  return new NonConvergenceError(
    `Voltage-dependent loads did not converge in ${iterations} iterations (possible voltage collapse: the loads ask for more power than the network can deliver). Worst mismatch at load '${t.ids[k]}': ${+mismatch[worst].toPrecision(4)} VA at terminal voltage ${puText} (last change ${lastChange[worst].toExponential(2)} pu; rated ${v.sRe[k]} + j${v.sIm[k]} VA at ${v.zipVolts[k]} V).`,
    { elementIds: [t.ids[k]], nodes: [t.nodeNames[f], t.nodeNames[to]] },
  );
}

/** Largest admittance magnitude of any element (S): with the largest voltage, the scale of the currents' roundoff. */
function admittanceScale(t: Topology): number {
  let m = 0;
  const arrays = [t.values.yRe, t.values.yIm, t.values.stampRe, t.values.stampIm, t.cy.re, t.cy.im];
  for (const a of arrays) for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]));
  return m;
}

function largestVoltage(vRe: Float64Array, vIm: Float64Array): number {
  let m = 0;
  for (let i = 0; i < vRe.length; i++) m = Math.max(m, Math.abs(vRe[i]) + Math.abs(vIm[i]));
  return m;
}

function largestCurrent(cRe: Float64Array, cIm: Float64Array): number {
  let m = 0;
  for (let i = 0; i < cRe.length; i++) m = Math.max(m, Math.abs(cRe[i]) + Math.abs(cIm[i]));
  return m;
}

/** Element currents (flat, at `t.currentOffset`) in the conventions of types.ts, the largest KCL residual (A), and the zip loads below the low-voltage threshold. */
function elementCurrents(
  t: Topology,
  vRe: Float64Array,
  vIm: Float64Array,
  lowPu: number,
): { cRe: Float64Array; cIm: Float64Array; maxKcl: number; lowVoltage: LowVoltageLoad[] } {
  const nn = t.nodeNames.length;
  const v = t.values;
  const kind = t.kind;
  const off = t.currentOffset;
  const cRe = new Float64Array(off[kind.length]);
  const cIm = new Float64Array(off[kind.length]);
  const lowVoltage: LowVoltageLoad[] = [];
  // outflow[i]: current leaving node i into the (non-tree) elements
  const oRe = new Float64Array(nn);
  const oIm = new Float64Array(nn);
  for (let k = 0; k < kind.length; k++) {
    const nodes = t.elNodes[k];
    const kk = kind[k];
    const at = off[k];
    if (kk === K_SOURCE_IDEAL || (kk === K_SWITCH && t.switchClosed[k])) continue; // from the trees below
    if (kk === K_COUPLED) {
      const m = nodes.length >> 1;
      const o = t.coupledOffset[k];
      const yRe = t.cy.re;
      const yIm = t.cy.im;
      for (let i = 0; i < m; i++) {
        let ir = 0;
        let ii = 0;
        for (let j = 0; j < m; j++) {
          const dr = vRe[nodes[j]] - vRe[nodes[m + j]];
          const di = vIm[nodes[j]] - vIm[nodes[m + j]];
          const yr = yRe[o + i * m + j];
          const yi = yIm[o + i * m + j];
          ir += yr * dr - yi * di;
          ii += yr * di + yi * dr;
        }
        cRe[at + i] = ir;
        cIm[at + i] = ii;
        oRe[nodes[i]] += ir;
        oIm[nodes[i]] += ii;
        oRe[nodes[m + i]] -= ir;
        oIm[nodes[m + i]] -= ii;
      }
      continue;
    }
    if (kk === K_ADMITTANCE) {
      const m = nodes.length;
      const o = v.stampOffset[k];
      for (let i = 0; i < m; i++) {
        let ir = 0;
        let ii = 0;
        for (let j = 0; j < m; j++) {
          const yr = v.stampRe[o + i * m + j];
          const yi = v.stampIm[o + i * m + j];
          ir += yr * vRe[nodes[j]] - yi * vIm[nodes[j]];
          ii += yr * vIm[nodes[j]] + yi * vRe[nodes[j]];
        }
        cRe[at + i] = ir;
        cIm[at + i] = ii;
        oRe[nodes[i]] += ir;
        oIm[nodes[i]] += ii;
      }
      continue;
    }
    // two-terminal elements: ir + j·ii flows from nodes[0] to nodes[1] through the element
    const a = nodes[0];
    const b = nodes[1];
    const dr = vRe[a] - vRe[b];
    const di = vIm[a] - vIm[b];
    let ir = 0;
    let ii = 0;
    let cr = 0; // the reported current (same as ir, ii except for sources)
    let ci = 0;
    if (kk === K_IMPEDANCE) {
      ir = v.yRe[k] * dr - v.yIm[k] * di;
      ii = v.yRe[k] * di + v.yIm[k] * dr;
      cr = ir;
      ci = ii;
    } else if (kk === K_SOURCE_Z) {
      // I = (E − (V+ − V−)) / Zs, leaving plus into the circuit (so flowing minus → plus inside)
      const er = v.sRe[k] - dr;
      const ei = v.sIm[k] - di;
      cr = v.yRe[k] * er - v.yIm[k] * ei;
      ci = v.yRe[k] * ei + v.yIm[k] * er;
      ir = -cr;
      ii = -ci;
    } else if (kk === K_CURRENT) {
      ir = v.sRe[k];
      ii = v.sIm[k];
      cr = ir;
      ci = ii;
    } else if (kk === K_ZIP) {
      zipCurrent(v, k, dr, di, lowPu);
      ir = ZC[0];
      ii = ZC[1];
      cr = ir;
      ci = ii;
      const pu = Math.hypot(dr, di) / v.zipVolts[k];
      if (pu < lowPu && v.zipZ[k] !== 1) lowVoltage.push({ id: t.ids[k], voltsPu: pu, lowVoltagePu: lowPu });
    }
    // (open switch: zero)
    cRe[at] = cr;
    cIm[at] = ci;
    oRe[a] += ir;
    oIm[a] += ii;
    oRe[b] -= ir;
    oIm[b] -= ii;
  }
  // Ideal elements: KCL leaf to root along each zero-impedance tree. F = net current leaving a
  // subtree into the other elements; the edge to the parent brings exactly F into the subtree.
  const fRe = oRe;
  const fIm = oIm;
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
    // switch: current from → to, i.e. from parent to child when the child is `to`; source: the
    // current leaving plus into the circuit is the current arriving at plus from the parent side
    const sign = kind[el] === K_SWITCH ? (t.elNodes[el][1] === c ? 1 : -1) : t.elNodes[el][0] === c ? 1 : -1;
    cRe[off[el]] = sign * Fr;
    cIm[off[el]] = sign * Fi;
  }
  // KCL residual: nodes off the trees and the roots of trees other than earth's (the tree edges
  // balance every other node exactly by construction)
  for (let i = 1; i < nn; i++) {
    if (t.treeParent[i] !== -1) continue;
    if (t.unknownOf[i] < 0) continue;
    maxKcl = Math.max(maxKcl, Math.hypot(fRe[i], fIm[i]));
  }
  return { cRe, cIm, maxKcl, lowVoltage };
}
