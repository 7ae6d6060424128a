/**
 * What the CLI prints with `--json` (no `--full`) for a primitive-only file, from its text, by the
 * typed path: scan (./scan-primitive-file.ts) → solve (./solve-scanned.ts) → the printed results
 * in the shape of ../results/printed-primitives.ts (PrintedPrimitiveResult), so one writer prints
 * both. The same numbers as the general path to the last bit: the solver does the same
 * operations, the totals are summed by the same TotalsSum in element order from the same
 * products (primitivePowers for sources; its impedance case written out below with the same
 * expressions), and the flags from the same computeFlags over the buses that can raise one
 * (flagBuses: the unbalance figures of busResults, from the same functions).
 *
 * Undefined when the file is not one the typed path takes (blocks, cases, limits, bus data,
 * unusual fields or anything the general path would report as an error): the caller then runs
 * the general path, which gives its own result or error message.
 */
import type { Cx, Primitive } from '../types.ts';
import { ANSI_C84_1, type LimitSet } from '../limits/limit-values.ts';
import { computeFlags } from '../limits/flags.ts';
import { primitivePowers, resultConventions, splitBusNode, TotalsSum } from '../results/build-results.ts';
import type { BusResult } from '../results/types.ts';
import { CONDUCTORS } from '../conductors.ts';
import { sub, toPhasor, ZERO } from '../phasor.ts';
import { sequenceComponents } from '../metrics/sequence.ts';
import { iecUnbalancePercent, maxDeviationUnbalancePercent } from '../metrics/unbalance.ts';
import type { PrintedPrimitiveResult } from '../results/printed-primitives.ts';
import { S_CURRENT_SOURCE, S_IMPEDANCE, scanPrimitiveFile, type ScannedPrimitives } from './scan-primitive-file.ts';
import { solveScanned, type ScannedSolution } from './solve-scanned.ts';

const TYPE_NAMES = ['impedance', 'voltageSource', 'currentSource'] as const;

/**
 * The printed results of the primitive-only circuit file `text`, or undefined (see the module
 * comment). `mark(stage)` is called after each stage (for the CLI's --timings).
 */
export function printedPrimitiveResultOfText(text: string, mark: (stage: 'scan' | 'solve') => void = () => {}): PrintedPrimitiveResult | undefined {
  const f = scanPrimitiveFile(text);
  if (!f) return undefined;
  mark('scan');
  const sol = solveScanned(f);
  if (!sol) return undefined;
  mark('solve');
  return printedOfScanned(f, sol);
}

function printedOfScanned(f: ScannedPrimitives, sol: ScannedSolution): PrintedPrimitiveResult {
  const { count, kind } = f;
  const { vRe, vIm, cRe, cIm } = sol;
  const totals = elementTotals(f, sol);
  const elementTypes = new Array<string>(count);
  for (let k = 0; k < count; k++) elementTypes[k] = TYPE_NAMES[kind[k]];
  const limits = ANSI_C84_1; // what resolveLimits() gives a file without settings
  const buses = flagBuses(f, vRe, vIm, limits);
  const currentStart = new Int32Array(count);
  for (let k = 0; k < count; k++) currentStart[k] = k;
  return {
    conventions: resultConventions(f.sequence),
    nodeNames: f.nodeNames,
    vRe,
    vIm,
    elementIds: f.ids,
    elementTypes,
    currentStart,
    currentCount: new Int32Array(count).fill(1),
    cRe,
    cIm,
    totals: totals.result(sol.maxKclResidualAmps),
    floating: [],
    flags: computeFlags(buses, [], [], limits, []),
    iterations: 1,
  };
}

/** The totals: every element's powers added in element order (a function of its own, see solveScanned). */
function elementTotals(f: ScannedPrimitives, sol: ScannedSolution): TotalsSum {
  const { count, kind, n1, n2 } = f;
  const { vRe, vIm, cRe, cIm } = sol;
  const totals = new TotalsSum();
  for (let k = 0; k < count; k++) {
    const kk = kind[k];
    const ir = cRe[k];
    const ii = cIm[k];
    if (kk === S_IMPEDANCE) {
      // absorbedPower of build-results.ts: Σ sign·V·I* over (from, +1), (to, −1)
      let re = 0;
      let im = 0;
      const a = n1[k];
      const b = n2[k];
      re += 1 * (vRe[a] * ir + vIm[a] * ii);
      im += 1 * (vIm[a] * ir - vRe[a] * ii);
      re += -1 * (vRe[b] * ir + vIm[b] * ii);
      im += -1 * (vIm[b] * ir - vRe[b] * ii);
      totals.add('load', { absorbed: { re, im } });
    } else {
      const prim: Primitive =
        kk === S_CURRENT_SOURCE
          ? { type: 'currentSource', id: f.ids[k], from: f.nodeNames[n1[k]], to: f.nodeNames[n2[k]], amps: { re: f.re[k], im: f.im[k] } }
          : { type: 'voltageSource', id: f.ids[k], plus: f.nodeNames[n1[k]], minus: f.nodeNames[n2[k]], volts: { re: f.re[k], im: f.im[k] } };
      // the source's two nodes by name, as the general path reads them
      const a = n1[k];
      const b = n2[k];
      const V = (name: string): Cx => {
        const i = name === f.nodeNames[a] ? a : b;
        return { re: vRe[i], im: vIm[i] };
      };
      totals.add('source', primitivePowers(prim, [{ re: ir, im: ii }], V, true));
    }
  }
  return totals;
}

/**
 * The buses that can raise a flag in a file with no bus data and no blocks, as busResults(…, forFlags)
 * gives them. Without nominal voltages no bus has voltage or neutral-shift flags (computeFlags needs
 * the nominal), and there are no floating parts here; only the unbalance of three-phase buses (a, b
 * and c present, no split-phase legs) remains. Those buses, in busResults' order (first named by a
 * node, in node order), with the same numbers from the same functions; the others are left out,
 * since they raise nothing: buses of fewer conductors, and those whose three unbalance figures are
 * all within `limits` (computeFlags raises an unbalance flag only for a figure above its limit; a
 * NaN is above none). Building a bus's result only when it flags matters on big files: ~5 000
 * three-phase buses, few or none flagged, each a dozen phasor objects and computeFlags' work.
 */
function flagBuses(f: ScannedPrimitives, vRe: Float64Array, vIm: Float64Array, limits: LimitSet): BusResult[] {
  const busIndex = new Map<string, number>();
  const busNames: string[] = [];
  const NC = CONDUCTORS.length;
  let at = new Int32Array(64 * NC).fill(-1); // node number of conductor c of bus b at b·NC + c
  for (let i = 0; i < f.nodeNames.length; i++) {
    const sp = splitBusNode(f.nodeNames[i]);
    if (!sp) continue;
    let b = busIndex.get(sp.bus);
    if (b === undefined) {
      b = busNames.length;
      busIndex.set(sp.bus, b);
      busNames.push(sp.bus);
      if ((b + 1) * NC > at.length) {
        const a2 = new Int32Array(2 * at.length).fill(-1);
        a2.set(at);
        at = a2;
      }
    }
    at[b * NC + (CONDUCTORS as readonly string[]).indexOf(sp.conductor)] = i;
  }
  const [A, B, C, N, L1, L2] = [0, 1, 2, 3, 4, 5];
  const out: BusResult[] = [];
  const V = (i: number) => ({ re: vRe[i], im: vIm[i] });
  for (let b = 0; b < busNames.length; b++) {
    const o = b * NC;
    if (at[o + A] < 0 || at[o + B] < 0 || at[o + C] < 0 || at[o + L1] >= 0 || at[o + L2] >= 0) continue;
    const va = V(at[o + A]);
    const vb = V(at[o + B]);
    const vc = V(at[o + C]);
    const hasN = at[o + N] >= 0;
    const vn = hasN ? V(at[o + N]) : ZERO;
    const lineToNeutral = { a: toPhasor(sub(va, vn)), b: toPhasor(sub(vb, vn)), c: toPhasor(sub(vc, vn)) };
    const lineToLine = { ab: toPhasor(sub(va, vb)), bc: toPhasor(sub(vb, vc)), ca: toPhasor(sub(vc, va)) };
    const s = sequenceComponents(va, vb, vc, f.sequence);
    const iec = iecUnbalancePercent(s.positive, s.negative);
    const nema = maxDeviationUnbalancePercent([lineToLine.ab.mag, lineToLine.bc.mag, lineToLine.ca.mag]);
    const ieee = maxDeviationUnbalancePercent([lineToNeutral.a.mag, lineToNeutral.b.mag, lineToNeutral.c.mag]);
    const u = limits.unbalanceLimits;
    if (!(iec > u.iec) && !(nema > u.nema) && !(ieee > u.ieee)) continue;
    const r: BusResult = {
      bus: busNames[b],
      kind: 'threePhase',
      conductors: hasN ? ['a', 'b', 'c', 'n'] : ['a', 'b', 'c'],
      toEarth: {},
      lineToNeutral,
      lnReference: hasN ? 'neutral' : 'earth',
      lineToLine,
      floating: false,
      iecUnbalancePercent: iec,
      nemaUnbalancePercent: nema,
      ieeeUnbalancePercent: ieee,
    };
    if (hasN) r.neutralToEarth = toPhasor(vn);
    out.push(r);
  }
  return out;
}
