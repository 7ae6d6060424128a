/**
 * Turn a primitive solution back into per-bus and per-block results: voltages, sequence
 * components, unbalance, port currents, powers, losses, loading, faults, totals and flags.
 */
import type { Cx, Primitive, PrimitiveSolution } from '../types.ts';
import { EARTH } from '../types.ts';
import { abs, add, conj, mul, neg, scale, sub, toPhasor, ZERO, type Phasor } from '../phasor.ts';
import type { Circuit } from '../schema/circuit.ts';
import { CONDUCTORS } from '../conductors.ts';
import type { ExpandContext, Expansion } from '../blocks/expansion.ts';
import { sequenceComponents, type SequenceComponents } from '../metrics/sequence.ts';
import { iecUnbalancePercent, maxDeviationUnbalancePercent } from '../metrics/unbalance.ts';
import type { LimitSet } from '../limits/limit-values.ts';
import { computeFlags, type LowVoltageLoadBranch } from '../limits/flags.ts';
import { terminalCurrents } from './terminal-currents.ts';
import { neutralCauses } from './neutral-cause.ts';
import { loadResults } from './load-results.ts';
import type { BusResult, CircuitResult, ElementResult, FaultResult, SequenceResult } from './types.ts';

const seqPhasors = (s: SequenceComponents): SequenceResult => ({ zero: toPhasor(s.zero), positive: toPhasor(s.positive), negative: toPhasor(s.negative) });
const CONDUCTOR_SET = new Set<string>(CONDUCTORS);

/** Split a node name "BUS.c" into bus and conductor when it follows the bus naming rule. */
export function splitBusNode(node: string): { bus: string; conductor: string } | null {
  const i = node.lastIndexOf('.');
  if (i <= 0) return null;
  const bus = node.slice(0, i);
  const conductor = node.slice(i + 1);
  if (bus.includes('.') || !CONDUCTOR_SET.has(conductor)) return null;
  return { bus, conductor };
}

/**
 * Per-bus results of every bus named by a port or by a node "BUS.c" (also used by the CLI's
 * printed-only path). `forFlags`: only what computeFlags reads (no voltages to earth and no
 * sequence phasors; the unbalance figures are still computed, from the same numbers).
 */
export function busResults(ctx: Pick<ExpandContext, 'nominal' | 'splitPhase' | 'sequence'>, expansions: readonly Expansion[], sol: { nodeVolts: { keys(): Iterable<string>; get(node: string): Cx | undefined } }, floatingNodes: Set<string>, forFlags = false): BusResult[] {
  const buses = new Map<string, Set<string>>();
  const order: string[] = [];
  const note = (bus: string) => {
    if (!buses.has(bus)) {
      buses.set(bus, new Set());
      order.push(bus);
    }
  };
  for (const e of expansions) for (const p of e.ports ?? []) if (p.bus) note(p.bus);
  for (const node of sol.nodeVolts.keys()) {
    const s = splitBusNode(node);
    if (s) {
      note(s.bus);
      buses.get(s.bus)!.add(s.conductor);
    }
  }
  const out: BusResult[] = [];
  for (const bus of order) {
    const present = buses.get(bus)!;
    const volts: Record<string, Cx> = {};
    for (const c of present) volts[c] = sol.nodeVolts.get(`${bus}.${c}`) ?? ZERO;
    const V = (_bus: string, c: string): Cx => volts[c] ?? ZERO;
    const conductors = CONDUCTORS.filter((c) => present.has(c));
    if (conductors.length === 0) continue;
    const split = ctx.splitPhase.has(bus) || present.has('1') || present.has('2');
    const nom = ctx.nominal.get(bus);
    const hasN = present.has('n');
    const toEarth: Record<string, Phasor> = {};
    if (!forFlags) for (const c of conductors) toEarth[c] = toPhasor(V(bus, c));
    const vn = hasN ? V(bus, 'n') : ZERO;
    const phases = (split ? ['1', '2'] : ['a', 'b', 'c']).filter((c) => present.has(c));
    const lineToNeutral: Record<string, Phasor> = {};
    for (const p of phases) lineToNeutral[p] = toPhasor(sub(V(bus, p), vn));
    const lineToLine: Record<string, Phasor> = {};
    const pairs = split ? [['1', '2']] : [['a', 'b'], ['b', 'c'], ['c', 'a']];
    for (const [p, q] of pairs) if (present.has(p) && present.has(q)) lineToLine[p + q] = toPhasor(sub(V(bus, p), V(bus, q)));
    const isFloating = conductors.some((c) => floatingNodes.has(`${bus}.${c}`));
    const r: BusResult = {
      bus,
      kind: split ? 'splitPhase' : 'threePhase',
      ...(nom ? { nominalVLL: nom.vLL, nominalVLN: nom.vLN } : {}),
      conductors,
      toEarth,
      lineToNeutral,
      lnReference: hasN ? 'neutral' : 'earth',
      lineToLine,
      floating: isFloating,
    };
    if (hasN) {
      r.neutralToEarth = toPhasor(vn);
      if (nom) r.neutralShiftPercent = (100 * abs(vn)) / nom.vLN;
    }
    if (!split && phases.length === 3) {
      const s = sequenceComponents(V(bus, 'a'), V(bus, 'b'), V(bus, 'c'), ctx.sequence);
      if (!forFlags) r.sequence = seqPhasors(s);
      r.iecUnbalancePercent = iecUnbalancePercent(s.positive, s.negative);
      r.nemaUnbalancePercent = maxDeviationUnbalancePercent(Object.values(lineToLine).map((v) => v.mag));
      r.ieeeUnbalancePercent = maxDeviationUnbalancePercent(Object.values(lineToNeutral).map((v) => v.mag));
      if (hasN && !forFlags) r.sequenceToNeutral = seqPhasors(sequenceComponents(sub(V(bus, 'a'), vn), sub(V(bus, 'b'), vn), sub(V(bus, 'c'), vn), ctx.sequence));
    }
    out.push(r);
  }
  return out;
}

interface ElementWork {
  result: ElementResult;
  absorbed: Cx;
  emf?: Cx;
  internalLoss?: Cx;
}

/** Power absorbed by one primitive, Σ V·I* over its terminals (currents into the element). */
function absorbedPower(p: Primitive, I: readonly Cx[], V: (n: string) => Cx): Cx {
  let re = 0;
  let im = 0;
  const acc = (node: string, i: Cx, sign: number) => {
    const v = V(node);
    re += sign * (v.re * i.re + v.im * i.im);
    im += sign * (v.im * i.re - v.re * i.im);
  };
  switch (p.type) {
    case 'voltageSource':
      acc(p.plus, I[0], -1);
      acc(p.minus, I[0], 1);
      break;
    case 'coupledBranch':
      for (let k = 0; k < p.from.length; k++) {
        acc(p.from[k], I[k], 1);
        acc(p.to[k], I[k], -1);
      }
      break;
    case 'admittanceMatrix':
      for (let k = 0; k < p.nodes.length; k++) acc(p.nodes[k], I[k], 1);
      break;
    default:
      acc(p.from, I[0], 1);
      acc(p.to, I[0], -1);
  }
  return { re, im };
}

/** The powers of one bare primitive: absorbed (Σ V·I*), the source's emf power and internal loss. */
export interface PrimitivePowers {
  absorbed: Cx;
  emf?: Cx;
  internalLoss?: Cx;
}

/**
 * Powers of a bare primitive from its solver currents `I` (shared by the full results and the CLI's
 * printed-only path, so both add up the same numbers in the same order).
 */
export function primitivePowers(prim: Primitive, I: readonly Cx[], V: (n: string) => Cx, isSource: boolean): PrimitivePowers {
  const absorbed = I.length ? absorbedPower(prim, I, V) : ZERO;
  let emf: Cx | undefined;
  if (prim.type === 'voltageSource' && I.length) emf = mul(prim.volts, conj(I[0]));
  else if (prim.type === 'currentSource') emf = neg(absorbed);
  const internalLoss = isSource && emf ? add(emf, absorbed) : undefined;
  return { absorbed, emf, internalLoss };
}

/** A bare primitive: its currents are the solver's (fast path: large primitive-only files). */
function primitiveResult(e: Expansion, sol: PrimitiveSolution, V: (n: string) => Cx): ElementWork {
  const t = e.primitives[0];
  const I = sol.elementCurrents.get(t.prim.id) ?? [];
  const isSource = e.category === 'source';
  const { absorbed, emf, internalLoss } = primitivePowers(t.prim, I, V, isSource);
  const result: ElementResult = {
    id: e.id,
    type: e.type,
    category: e.category,
    currents: I.map(toPhasor),
    currentDirection: 'primitive',
    power: toPhasor(isSource ? neg(absorbed) : absorbed),
  };
  if (t.prim.type === 'voltageSource' && emf) result.emfPower = toPhasor(emf);
  if (internalLoss) result.losses = toPhasor(internalLoss);
  if (e.category === 'series') result.losses = result.power;
  return { result, absorbed, emf, internalLoss };
}

function elementResult(e: Expansion, sol: PrimitiveSolution, sequence: 'ABC' | 'ACB'): ElementWork {
  const V = (n: string): Cx => sol.nodeVolts.get(n) ?? ZERO;
  if (!e.ports) return primitiveResult(e, sol, V);
  const into = new Map<string, Cx>();
  const perPhase = new Map<string, Cx>();
  const branch = new Map<string, Cx>();
  let absorbed = ZERO;
  let emf: Cx | undefined;
  for (const t of e.primitives) {
    const I = sol.elementCurrents.get(t.prim.id) ?? [];
    if (I.length === 0) continue;
    let sPrim = ZERO;
    for (const [node, i] of terminalCurrents(t.prim, I)) {
      into.set(node, add(into.get(node) ?? ZERO, i));
      sPrim = add(sPrim, mul(V(node), conj(i)));
    }
    absorbed = add(absorbed, sPrim);
    if (t.role === 'emf' && t.prim.type === 'voltageSource') {
      const sEmf = mul(t.prim.volts, conj(I[0]));
      emf = add(emf ?? ZERO, sEmf);
      if (t.phase) perPhase.set(t.phase, add(perPhase.get(t.phase) ?? ZERO, sEmf));
    } else if (t.phase && e.category !== 'source') {
      perPhase.set(t.phase, add(perPhase.get(t.phase) ?? ZERO, sPrim));
      if (t.prim.type === 'impedance' || t.prim.type === 'zipLoad' || t.prim.type === 'switch') branch.set(t.phase, I[0]);
    }
  }
  if (e.type === 'currentSource') emf = neg(absorbed);
  const sign = e.currentDirection === 'out-of-element' ? -1 : 1;
  let currents: Cx[];
  let ports: ElementResult['ports'];
  if (e.ports) {
    ports = e.ports.map((p) => {
      const cs = p.nodes.map((n) => scale(into.get(n) ?? ZERO, sign));
      const [ka, kb, kc] = ['a', 'b', 'c'].map((c) => p.conductors.indexOf(c));
      const seq = ka >= 0 && kb >= 0 && kc >= 0 ? { sequence: seqPhasors(sequenceComponents(cs[ka], cs[kb], cs[kc], sequence)) } : {};
      return { ...(p.bus ? { bus: p.bus } : {}), conductors: p.conductors, nodes: p.nodes, currents: cs.map(toPhasor), ...seq };
    });
    currents = e.ports.flatMap((p) => p.nodes.map((n) => scale(into.get(n) ?? ZERO, sign)));
  } else {
    currents = sol.elementCurrents.get(e.primitives[0].prim.id) ?? [];
  }
  const isSource = e.category === 'source';
  const power = isSource ? neg(absorbed) : absorbed;
  const result: ElementResult = {
    id: e.id,
    type: e.type,
    category: e.category,
    currents: currents.map(toPhasor),
    currentDirection: e.currentDirection,
    ...(ports ? { ports } : {}),
    power: toPhasor(power),
  };
  // Current into earth: by KCL over the block, the sum of the currents entering it at every other node
  // (this also catches the implicit earth return of admittance stamps, e.g. line shunt admittance).
  let toEarth = ZERO;
  for (const [node, i] of into) if (node !== EARTH) toEarth = add(toEarth, i);
  if (into.has(EARTH) || e.primitives.some((t) => t.role === 'earth' || t.prim.type === 'admittanceMatrix')) result.earthCurrent = toPhasor(toEarth);
  const abcPort = e.ports?.find((p) => ['a', 'b', 'c'].every((c) => p.conductors.includes(c)));
  if (abcPort && ports) {
    const pr = ports[e.ports!.indexOf(abcPort)];
    const ix = (c: string) => pr.currents[abcPort.conductors.indexOf(c)];
    const [ia, ib, ic] = ['a', 'b', 'c'].map((c) => ({ re: ix(c).re, im: ix(c).im }));
    result.sequenceCurrents = seqPhasors(sequenceComponents(ia, ib, ic, sequence));
  }
  if (branch.size > 0) result.branchCurrents = Object.fromEntries([...branch].map(([k, v]) => [k, toPhasor(v)]));
  if (perPhase.size > 0) result.powerPerPhase = Object.fromEntries([...perPhase].map(([k, v]) => [k, toPhasor(v)]));
  let internalLoss: Cx | undefined;
  if (isSource && emf) {
    result.emfPower = toPhasor(emf);
    internalLoss = sub(emf, power);
    result.losses = toPhasor(internalLoss);
  }
  if (e.category === 'series') result.losses = toPhasor(absorbed);
  if (e.meta?.kind === 'transformer') {
    let worst = 0;
    for (const w of e.meta.windings) {
      const I = sol.elementCurrents.get(w.primId) ?? [];
      if (I.length === 0) continue;
      worst = Math.max(worst, abs(I[w.hvIndex]) / w.hvRatedAmps, ...w.lvIndexes.map((k) => abs(I[k]) / w.lvRatedAmps));
    }
    result.loadingPercent = 100 * worst;
    result.phaseShift = { convention: e.meta.convention, vectorGroup: e.meta.vectorGroup, lvLagsHvDeg: e.meta.lagDeg };
    if (e.meta.tapPercent !== undefined) result.tapPercent = e.meta.tapPercent;
  }
  return { result, absorbed, emf, internalLoss };
}

/** The work of one element that the totals need. */
export type TotalsWork = PrimitivePowers;

/**
 * Sums of source, load, fault and loss powers over the elements, added in element order (the
 * full results and the CLI's printed-only path share it: same additions, same last bits).
 */
export class TotalsSum {
  private acc: Record<'source' | 'load' | 'fault' | 'losses', { re: number; im: number }> = { source: { re: 0, im: 0 }, load: { re: 0, im: 0 }, fault: { re: 0, im: 0 }, losses: { re: 0, im: 0 } };

  private addTo(key: 'source' | 'load' | 'fault' | 'losses', c: Cx): void {
    this.acc[key].re += c.re;
    this.acc[key].im += c.im;
  }

  /** Add one element of category `category`. */
  add(category: string, w: TotalsWork): void {
    if (category === 'source') this.addTo('source', w.emf ?? neg(w.absorbed));
    else if (category === 'load' || category === 'fault') this.addTo(category, w.absorbed);
    else this.addTo('losses', w.absorbed); // series elements and earth electrodes
    if (w.internalLoss) this.addTo('losses', w.internalLoss);
  }

  /** The totals of the result. */
  result(maxKclResidualAmps: number): CircuitResult['totals'] {
    const { source, load, fault, losses } = this.acc;
    const residual = sub(sub(sub(source, load), fault), losses);
    return {
      sourcePower: toPhasor(source),
      loadPower: toPhasor(load),
      faultPower: toPhasor(fault),
      losses: toPhasor(losses),
      powerBalanceResidual: toPhasor(residual),
      maxKclResidualAmps,
    };
  }
}

/** Voltage-dependent load branches the solver found below their low-voltage threshold, named by their element. */
export function lowVoltageLoadBranches(expansions: Expansion[], sol: PrimitiveSolution): LowVoltageLoadBranch[] {
  const lowLoads: LowVoltageLoadBranch[] = [];
  if (sol.lowVoltageLoads && sol.lowVoltageLoads.length > 0) {
    const owner = new Map<string, { e: Expansion; phase?: string }>();
    for (const e of expansions) for (const t of e.primitives) if (t.prim.type === 'zipLoad') owner.set(t.prim.id, { e, phase: t.phase });
    for (const l of sol.lowVoltageLoads) {
      const o = owner.get(l.id);
      const prim = o?.e.primitives.find((t) => t.prim.id === l.id)?.prim;
      const volts = prim && prim.type === 'zipLoad' ? l.voltsPu * prim.ratedVolts : NaN;
      const multi = o ? o.e.primitives.length > 1 : false;
      lowLoads.push({ elementId: o?.e.id ?? l.id, ...(multi && o?.phase ? { branch: o.phase } : {}), volts, voltsPu: l.voltsPu, lowVoltagePu: l.lowVoltagePu });
    }
  }
  return lowLoads;
}

/** The conventions stated in every result. */
export function resultConventions(sequence: 'ABC' | 'ACB'): CircuitResult['conventions'] {
  return {
    phasors: 'RMS',
    power: 'S = V·I*, load convention, Q > 0 lagging',
    sequence,
    sequenceComponents:
      sequence === 'ABC'
        ? 'a = 1∠120°: X0 = (Xa+Xb+Xc)/3, X1 = (Xa+aXb+a²Xc)/3, X2 = (Xa+a²Xb+aXc)/3; bus sequence voltages are given of the phase-to-earth voltages and of the line-to-neutral voltages (relative to the bus neutral)'
        : 'ACB system: positive sequence is the system rotation, X1 = (Xa+a²Xb+aXc)/3, X2 = (Xa+aXb+a²Xc)/3 (a = 1∠120°); bus sequence voltages are given of the phase-to-earth voltages and of the line-to-neutral voltages (relative to the bus neutral)',
    transformerShift: 'per transformer (phaseShift): IEC clock number (LV lags HV by clock × 30° in an ABC system) or the North American rule (LV lags HV by 30° for D–Y and Y–D)',
  };
}

/** Build the whole typed result. */
export function buildResults(circuit: Circuit, ctx: ExpandContext, expansions: Expansion[], sol: PrimitiveSolution, limits: LimitSet): CircuitResult {
  const nodes: Record<string, Phasor> = {};
  for (const [n, v] of sol.nodeVolts) nodes[n] = toPhasor(v);
  const floatingNodes = new Set(sol.floating.flatMap((f) => f.nodes));
  const buses = busResults(ctx, expansions, sol, floatingNodes);
  const causes = neutralCauses(circuit, buses.filter((b) => b.conductors.includes('n')).map((b) => b.bus));
  for (const b of buses) {
    const c = causes.get(b.bus);
    if (!c) continue;
    b.neutralCause = c.cause;
    if (c.openAt) b.neutralOpenAt = c.openAt;
  }
  const loads = loadResults(expansions, sol.nodeVolts, limits);
  const works = expansions.map((e) => elementResult(e, sol, ctx.sequence));
  const totals = new TotalsSum();
  for (const w of works) totals.add(w.result.category, w);
  const elements: Record<string, ElementResult> = {};
  for (const w of works) elements[w.result.id] = w.result;
  const faults: FaultResult[] = [];
  for (const e of expansions) {
    if (e.meta?.kind !== 'fault') continue;
    const r = elements[e.id];
    const port = r.ports![0];
    const get = (c: string) => port.currents[port.conductors.indexOf(c)];
    const cs = { a: get('a'), b: get('b'), c: get('c') };
    faults.push({
      id: e.id,
      bus: e.meta.bus,
      kind: e.meta.faultKind,
      phases: e.meta.phases,
      phaseCurrents: cs,
      sequence: seqPhasors(sequenceComponents(cs.a, cs.b, cs.c, ctx.sequence)),
      earthCurrent: r.earthCurrent ?? toPhasor(ZERO),
    });
  }
  const elementList = works.map((w) => w.result);
  return {
    ...(circuit.name !== undefined ? { name: circuit.name } : {}),
    frequencyHz: circuit.frequencyHz,
    conventions: resultConventions(ctx.sequence),
    nodes,
    buses,
    elements,
    loads,
    faults,
    totals: totals.result(sol.maxKclResidualAmps),
    floating: sol.floating,
    flags: computeFlags(buses, elementList, sol.floating, limits, lowVoltageLoadBranches(expansions, sol), loads),
    limits,
    iterations: sol.iterations,
  };
}
