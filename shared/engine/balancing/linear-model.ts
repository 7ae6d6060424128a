/**
 * The linearised unbalanced model the MILP optimises and the local search ranks candidates with.
 *
 * Method — sensitivity (current-injection) linearisation about an exact operating point, what
 * is implemented here: each customer is treated as a current drawn from phase p to the neutral of
 * its bus, I = conj(S / V⁰ₚₙ), at the line-to-neutral voltage V⁰ of the exact solve of the
 * assignment in hand (the first fixed-point iterate of the constant-power load equations).
 * Published linear models of multiphase feeders built on the same idea — loads as injections at
 * an operating point, the network linear in them — include A. Bernstein & E. Dall'Anese, "Linear
 * power-flow models in multiphase distribution networks", IEEE ISGT Europe 2017 (M), and
 * A. Garcés, "A linear three-phase load flow for power distribution systems", IEEE Trans. Power
 * Systems 31(1), 2016 (M); this file does not reproduce their formulas. Every quantity the
 * objectives are made of — the neutral
 * current, each bus's positive- and negative-sequence voltage, its line and phase voltages, each
 * customer bus-phase voltage, each series element's conductor currents — responds to that
 * current through a transfer coefficient T(bus, phase), measured here by the exact engine itself:
 * one solve with a test load of δ kW added between that phase and the neutral (a secant of the
 * size of a typical customer, so the coefficients include the loads' and the network's own
 * response). With the quantity vector q of the current assignment, moving customer c from p to p′
 * predicts q + T(b,p′)·I(c,p′) − T(b,p)·I(c,p) (superposition). Losses are Σ r·|I|² per series
 * element with r its losses over Σ|I|² at the operating point (P).
 */
import type { Cx } from '../types.ts';
import { abs } from '../phasor.ts';
import type { CircuitResult } from '../results/types.ts';
import { circuitResults, prepareCircuit } from '../solve-circuit.ts';
import { solvePrimitives } from '../solver/index.ts';
import { busNode } from '../blocks/expansion.ts';
import type { ZipLoadPrimitive } from '../types.ts';
import { maxDeviationUnbalancePercent } from '../metrics/unbalance.ts';
import type { BalancePhase, Customer } from './customers.ts';
import { allowedPhases, withCustomers, type Assignment, type BalanceFeeder } from './feeder.ts';
import { exactFigures, neutralCurrent, type BalanceFigures, type NeutralPoint } from './figures.ts';

/** Where each quantity sits in an observation vector (complex entries, re/im interleaved). */
export interface Layout {
  point: NeutralPoint;
  /** Three-phase buses with a, b and c: entries v1, v2, ab, bc, ca, a, b, c from `busAt`. */
  buses: string[];
  busAt: number;
  /** Customer bus-phases `<bus>.<A|B|C>`: line-to-neutral voltage, from `slotAt`. */
  slots: string[];
  slotIndex: Map<string, number>;
  slotAt: number;
  /** Series elements (and source impedances) with losses: conductor currents of one port, from `branchAt`. */
  branches: { id: string; conductors: number; r: number; at: number }[];
  size: number;
  /** Rated volts of each customer (its own terminal rating). */
  rated: Map<string, number>;
}

/** An exact state the predictions are anchored on. */
export interface Anchor {
  assignment: Assignment;
  q: Float64Array;
  figures: BalanceFigures;
}

export interface LinearModel {
  layout: Layout;
  /** Transfer of each slot: Δq per ampere drawn (complex vector, re/im interleaved). */
  transfer: Float64Array[];
  /** Current each customer draws on each allowed phase, A (complex), at the operating point's voltage. */
  draw: Map<string, Map<BalancePhase, Cx>>;
  /** Exact solves used to build it. */
  solves: number;
}

const put = (q: Float64Array, at: number, v: Cx) => {
  q[2 * at] = v.re;
  q[2 * at + 1] = v.im;
};
const get = (q: Float64Array, at: number): Cx => ({ re: q[2 * at], im: q[2 * at + 1] });

/** The layout of the quantities, from an exact solve. */
export function makeLayout(r: CircuitResult, customers: Customer[], feeder: BalanceFeeder, point: NeutralPoint): Layout {
  const buses = r.buses.filter((b) => b.sequence && b.lineToLine.ab && b.lineToLine.bc && b.lineToLine.ca).map((b) => b.bus);
  const slots: string[] = [];
  const slotIndex = new Map<string, number>();
  for (const c of customers)
    for (const p of new Set([c.phase, ...allowedPhases(feeder, c)])) {
      const key = `${c.bus}.${p}`;
      if (!slotIndex.has(key)) (slotIndex.set(key, slots.length), slots.push(key));
    }
  const busAt = 1;
  const slotAt = busAt + 8 * buses.length;
  let at = slotAt + slots.length;
  const branches: Layout['branches'] = [];
  for (const [id, e] of Object.entries(r.elements)) {
    const port = e.ports?.[0];
    if (!e.losses || !port || e.category === 'load') continue;
    const sq = port.currents.reduce((s, i) => s + i.mag * i.mag, 0);
    if (!(sq > 0) || !(e.losses.re > 0)) continue;
    branches.push({ id, conductors: port.currents.length, r: e.losses.re / sq, at });
    at += port.currents.length;
  }
  const rated = new Map<string, number>();
  const byId = new Map(r.loads.map((l) => [l.id, l]));
  for (const c of customers) rated.set(c.customer, byId.get(c.customer)?.branches[0]?.ratedVolts ?? NaN);
  return { point, buses, busAt, slots, slotIndex, slotAt, branches, size: at, rated };
}

/** The observation vector of an exact solve. */
export function observe(r: CircuitResult, layout: Layout): Float64Array {
  const q = new Float64Array(2 * layout.size);
  put(q, 0, neutralCurrent(r, layout.point));
  const busOf = new Map(r.buses.map((b) => [b.bus, b]));
  layout.buses.forEach((name, k) => {
    const b = busOf.get(name)!;
    const at = layout.busAt + 8 * k;
    put(q, at, b.sequence!.positive);
    put(q, at + 1, b.sequence!.negative);
    put(q, at + 2, b.lineToLine.ab);
    put(q, at + 3, b.lineToLine.bc);
    put(q, at + 4, b.lineToLine.ca);
    put(q, at + 5, b.lineToNeutral.a);
    put(q, at + 6, b.lineToNeutral.b);
    put(q, at + 7, b.lineToNeutral.c);
  });
  layout.slots.forEach((key, k) => {
    const dot = key.lastIndexOf('.');
    const v = busOf.get(key.slice(0, dot))?.lineToNeutral[key.slice(dot + 1).toLowerCase()];
    if (v) put(q, layout.slotAt + k, v);
  });
  for (const br of layout.branches) r.elements[br.id].ports![0].currents.forEach((i, k) => put(q, br.at + k, i));
  return q;
}

/** Σ r·|I|² over the branches of an observation, W. */
export function branchLossesW(q: Float64Array, layout: Layout): number {
  let s = 0;
  for (const br of layout.branches) {
    let sq = 0;
    for (let k = 0; k < br.conductors; k++) sq += q[2 * (br.at + k)] ** 2 + q[2 * (br.at + k) + 1] ** 2;
    s += br.r * sq;
  }
  return s;
}

/** The figures an observation implies (losses anchored on the exact losses of `anchor`). */
export function predictedFigures(q: Float64Array, layout: Layout, customers: Customer[], assignment: Assignment, anchor: Anchor): BalanceFigures {
  const worst = { iec: 0, nema: 0, ieee: 0 };
  for (let k = 0; k < layout.buses.length; k++) {
    const at = layout.busAt + 8 * k;
    const v1 = abs(get(q, at));
    worst.iec = Math.max(worst.iec, v1 > 0 ? (100 * abs(get(q, at + 1))) / v1 : 0);
    worst.nema = Math.max(worst.nema, maxDeviationUnbalancePercent([abs(get(q, at + 2)), abs(get(q, at + 3)), abs(get(q, at + 4))]));
    worst.ieee = Math.max(worst.ieee, maxDeviationUnbalancePercent([abs(get(q, at + 5)), abs(get(q, at + 6)), abs(get(q, at + 7))]));
  }
  let lo = Infinity;
  let hi = -Infinity;
  for (const c of customers) {
    const pu = abs(get(q, layout.slotAt + layout.slotIndex.get(`${c.bus}.${assignment[c.customer]}`)!)) / layout.rated.get(c.customer)!;
    lo = Math.min(lo, pu);
    hi = Math.max(hi, pu);
  }
  return {
    neutralCurrentA: abs(get(q, 0)),
    maxUnbalancePercent: worst,
    lossesKw: anchor.figures.lossesKw + (branchLossesW(q, layout) - branchLossesW(anchor.q, layout)) / 1000,
    minCustomerVoltagePu: lo,
    maxCustomerVoltagePu: hi,
  };
}

const TEST_LOAD = 'balance~test';
/**
 * Convergence tolerance of the sensitivity solves, pu of the loads' rated voltage: 1e-7 pu is
 * ~2e-5 V at 230 V, against the ~0.1–1 V a typical customer's test load moves a voltage (P).
 */
const SENSITIVITY_TOLERANCE = 1e-7;

/**
 * Build the model about the exact solve `base` of `assignment`: one extra exact solve per customer
 * bus-phase (see the file header).
 */
export function buildLinearModel(feeder: BalanceFeeder, customers: Customer[], assignment: Assignment, base: CircuitResult, point: NeutralPoint, shouldStop?: () => boolean): { model: LinearModel; anchor: Anchor } {
  const layout = makeLayout(base, customers, feeder, point);
  const q0 = observe(base, layout);
  const anchor: Anchor = { assignment, q: q0, figures: exactFigures(base, customers, point).figures };
  const movable = customers.filter((c) => !c.fixed);
  const meanKw = movable.reduce((s, c) => s + Math.hypot(c.kw, c.kvar), 0) / Math.max(1, movable.length);
  const deltaKw = meanKw > 0 ? meanKw : 1;
  const circuit = withCustomers(feeder, customers, assignment);
  const transfer: Float64Array[] = [];
  let solves = 0;
  // The circuit is validated and expanded once, with the test load on the first slot; for each
  // slot only the test load's two nodes change in the primitive list before the solve (the
  // results read below — bus voltages, series-element currents and losses — come from the
  // solution alone; the test load's own result is never read).
  const firstBus = layout.slots[0]?.slice(0, layout.slots[0].lastIndexOf('.'));
  const test = { type: 'load' as const, id: TEST_LOAD, bus: firstBus, connection: 'single' as const, between: ['a', 'n'] as ['a', 'n'], each: { kw: deltaKw, kvar: 0, model: 'power' as const } };
  const prepared = layout.slots.length ? prepareCircuit({ ...circuit, elements: [...circuit.elements, test] }) : undefined;
  const testIndex = prepared ? prepared.primitives.findIndex((p) => p.type === 'zipLoad' && p.id.startsWith(TEST_LOAD)) : -1;
  for (const key of layout.slots) {
    if (shouldStop?.()) throw new BalanceCancelled();
    const dot = key.lastIndexOf('.');
    const bus = key.slice(0, dot);
    const phase = key.slice(dot + 1).toLowerCase();
    const primitives = prepared!.primitives.slice();
    const prim = primitives[testIndex] as ZipLoadPrimitive;
    primitives[testIndex] = { ...prim, from: busNode(bus, phase), to: busNode(bus, 'n') };
    const r = circuitResults(prepared!, solvePrimitives(primitives, { tolerance: SENSITIVITY_TOLERANCE }));
    solves++;
    const q = observe(r, layout);
    const v0 = get(q0, layout.slotAt + layout.slotIndex.get(key)!);
    // the test load's current at the operating point: conj(S / V) = P / conj(V)
    const di = divide({ re: deltaKw * 1000, im: 0 }, { re: v0.re, im: -v0.im });
    const t = new Float64Array(2 * layout.size);
    for (let j = 0; j < layout.size; j++) {
      const d = divide({ re: q[2 * j] - q0[2 * j], im: q[2 * j + 1] - q0[2 * j + 1] }, di);
      t[2 * j] = d.re;
      t[2 * j + 1] = d.im;
    }
    transfer.push(t);
  }
  const draw = new Map<string, Map<BalancePhase, Cx>>();
  for (const c of customers) {
    const m = new Map<BalancePhase, Cx>();
    for (const p of new Set([c.phase, ...allowedPhases(feeder, c)])) {
      const v = get(q0, layout.slotAt + layout.slotIndex.get(`${c.bus}.${p}`)!);
      m.set(p, divide({ re: c.kw * 1000, im: -c.kvar * 1000 }, { re: v.re, im: -v.im })); // conj(S/V) = conj(S)/conj(V)
    }
    draw.set(c.customer, m);
  }
  return { model: { layout, transfer, draw, solves }, anchor };
}

function divide(a: Cx, b: Cx): Cx {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
}

/** Add (sign +1) or remove (−1) customer c on phase p to observation q, in place. */
export function shift(model: LinearModel, q: Float64Array, c: Customer, p: BalancePhase, sign: 1 | -1): void {
  const i = model.draw.get(c.customer)!.get(p)!;
  const t = model.transfer[model.layout.slotIndex.get(`${c.bus}.${p}`)!];
  const ir = sign * i.re;
  const ii = sign * i.im;
  for (let j = 0; j < t.length; j += 2) {
    q[j] += t[j] * ir - t[j + 1] * ii;
    q[j + 1] += t[j] * ii + t[j + 1] * ir;
  }
}

/** The complex coefficient of customer c on phase p for quantity j (Δq_j per unit of x). */
export function coefficient(model: LinearModel, c: Customer, p: BalancePhase, j: number): Cx {
  const i = model.draw.get(c.customer)!.get(p)!;
  const t = model.transfer[model.layout.slotIndex.get(`${c.bus}.${p}`)!];
  return { re: t[2 * j] * i.re - t[2 * j + 1] * i.im, im: t[2 * j] * i.im + t[2 * j + 1] * i.re };
}

/** Thrown when the caller cancels a balancing run. */
export class BalanceCancelled extends Error {
  constructor() {
    super('the balancing was cancelled');
    this.name = 'BalanceCancelled';
  }
}

export { get as entry };
