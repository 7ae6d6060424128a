/**
 * `--json` (without `--full`) of a primitive-only circuit written straight from arrays: the same
 * bytes as `writeJson(jsonResult(result))` of solve.ts, without building the full results. Two
 * sources, one writer (writePrintedResult): the typed path's printedPrimitiveResultOfText
 * (shared/engine/typed, from the file's text) and, for primitive-only files it declines,
 * printedPrimitiveResults of the general solver's solution (shared/engine/results/printed-primitives.ts).
 * Bytes are gathered into ~64 KB chunks before each write. The writer itself is in
 * printed-write.ts (no engine modules: the lean bundle of the typed path loads it).
 *
 * How (printed-write.ts): UTF-8 bytes written straight into Buffers, the numbers' text from one
 * JSON.stringify per batch of numbers (the shortest text that reads back to the same double; a
 * non-finite number as null), no string and no object per phasor. Same bytes: the keys in
 * jsonResult's order, the phasors from the same toPhasor. Records keep insertion order except for
 * keys that look like array indexes (a JavaScript object lists those first, in numeric order) and
 * "__proto__" (kept as a key in a null-prototype object, but the general path's records are
 * plain objects): a file with such an element id or node name takes the general path.
 */
import { isPrimitiveOnly, printedPrimitiveResults } from '../../shared/engine/results/printed-primitives.ts';
import type { PreparedCircuit } from '../../shared/engine/solve-circuit.ts';
import type { PrimitiveSolution } from '../../shared/engine/types.ts';
import { writePrintedResult } from './printed-write.ts';

export { writePrintedResult };

/** Keys whose place in a plain object differs from insertion order (or that do not become keys). */
const isSpecialKey = (k: string) => k === '__proto__' || /^(0|[1-9]\d{0,9})$/.test(k);

/**
 * Write the `--json` result of `prepared` (solved as `sol` by solvePrimitives) through `write`
 * and return true, or return false without writing anything when the circuit is not
 * primitive-only or has a special key (the caller then takes the general path).
 */
export function writePrintedPrimitiveJson(prepared: PreparedCircuit, sol: PrimitiveSolution, write: (chunk: Uint8Array) => void, chunkBytes?: number): boolean {
  if (!isPrimitiveOnly(prepared)) return false;
  for (const e of prepared.expansions) if (isSpecialKey(e.id)) return false;
  const r = printedPrimitiveResults(prepared, sol);
  if (!r) return false;
  for (const n of r.nodeNames) if (isSpecialKey(n)) return false;
  writePrintedResult(r, write, chunkBytes);
  return true;
}
