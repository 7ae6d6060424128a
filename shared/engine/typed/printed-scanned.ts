/**
 * What the CLI prints with `--json` (no `--full`) for a primitive-only file, from its text, by the
 * typed path: scan (./scan-primitive-file.ts) → solve (./solve-scanned.ts) → the printed results
 * in the shape of ../results/printed-primitives.ts (PrintedPrimitiveResult), so one writer prints
 * both. The same numbers as the general path to the last bit: the solver does the same
 * operations, the totals are summed by the same TotalsSum in element order from the same
 * products (primitivePowers for sources; its impedance case written out below with the same
 * expressions), and the flags come from the same busResults and computeFlags.
 *
 * Undefined when the file is not one the typed path takes (blocks, cases, limits, bus data,
 * unusual fields or anything the general path would report as an error): the caller then runs
 * the general path, which gives its own result or error message.
 */
import type { Cx, Primitive } from '../types.ts';
import { resolveLimits } from '../limits/limit-sets.ts';
import { computeFlags } from '../limits/flags.ts';
import { busResults, primitivePowers, resultConventions, TotalsSum } from '../results/build-results.ts';
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
  const { count, kind, n1, n2 } = f;
  const { vRe, vIm, cRe, cIm } = sol;
  const totals = new TotalsSum();
  const elementTypes = new Array<string>(count);
  const V = (name: string): Cx => {
    const i = f.nodeIndex.get(name)!;
    return { re: vRe[i], im: vIm[i] };
  };
  for (let k = 0; k < count; k++) {
    const kk = kind[k];
    elementTypes[k] = TYPE_NAMES[kk];
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
      totals.add('source', primitivePowers(prim, [{ re: ir, im: ii }], V, true));
    }
  }
  const nodeVolts = {
    keys: () => f.nodeNames,
    get: (name: string): Cx | undefined => {
      const i = f.nodeIndex.get(name);
      return i === undefined ? undefined : { re: vRe[i], im: vIm[i] };
    },
  };
  // no bus data, no blocks: no nominal voltages, no split-phase buses; the buses only for the flags
  const buses = busResults({ nominal: new Map(), splitPhase: new Set(), sequence: f.sequence }, [], { nodeVolts }, new Set(), true);
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
    flags: computeFlags(buses, [], [], resolveLimits(undefined, undefined), []),
    iterations: 1,
  };
}
