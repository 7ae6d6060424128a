/**
 * `--json` (without `--full`) of a primitive-only circuit written straight from the solver's
 * arrays: the same bytes as `writeJson(jsonResult(result))` of solve.ts, without building the
 * full results (see shared/engine/results/printed-primitives.ts). Text is gathered into ~1 MB
 * chunks before each write.
 *
 * How: the nodes and elements are serialized a batch of entries at a time by one native
 * JSON.stringify of a plain object of phasor objects (as writeJson does for the general path):
 * measured ~2× faster than formatting each number in JavaScript, since the number-to-text
 * conversion is most of the cost. Same bytes: the batch objects have the general path's shape and
 * key order, and its phasors come from the same toPhasor. Records keep insertion order except for
 * keys that look like array indexes (a JavaScript object lists those first, in numeric order) and
 * "__proto__" (kept as a key in a null-prototype object, but the general path's records are
 * plain objects): a file with such an element id or node name takes the general path.
 */
import { isPrimitiveOnly, printedPrimitiveResults, toPhasor, type PreparedCircuit, type Phasor, type PrimitiveSolution } from '../../shared/engine/index.ts';

/** Keys whose place in a plain object differs from insertion order (or that do not become keys). */
const isSpecialKey = (k: string) => k === '__proto__' || /^(0|[1-9]\d{0,9})$/.test(k);

/** Entries per native JSON.stringify call. */
const BATCH = 512;

/**
 * Write the `--json` result of `prepared` (solved as `sol` by solvePrimitives) through `write`
 * and return true, or return false without writing anything when the circuit is not
 * primitive-only or has a special key (the caller then takes the general path).
 */
export function writePrintedPrimitiveJson(prepared: PreparedCircuit, sol: PrimitiveSolution, write: (chunk: string) => void, chunkChars = 1 << 20): boolean {
  if (!isPrimitiveOnly(prepared)) return false;
  for (const e of prepared.expansions) if (isSpecialKey(e.id)) return false;
  const r = printedPrimitiveResults(prepared, sol);
  if (!r) return false;
  const { nodeNames, vRe, vIm, cRe, cIm, currentStart, currentCount } = r;
  for (const n of nodeNames) if (isSpecialKey(n)) return false;
  let buf = '';
  const push = (s: string) => {
    buf += s;
    if (buf.length >= chunkChars) {
      write(buf);
      buf = '';
    }
  };
  /** Entries `key(i): value(i)` for i < count, as the inside of a JSON object, a batch per stringify. */
  const record = (count: number, key: (i: number) => string, value: (i: number) => unknown) => {
    let first = true;
    for (let lo = 0; lo < count; lo += BATCH) {
      const batch: Record<string, unknown> = Object.create(null);
      const hi = Math.min(count, lo + BATCH);
      for (let i = lo; i < hi; i++) batch[key(i)] = value(i);
      const text = JSON.stringify(batch);
      push(`${first ? '' : ','}${text.slice(1, -1)}`);
      first = false;
    }
  };
  // the keys in jsonResult's order
  push(`{"format":"wyeward-result","version":1,"conventions":${JSON.stringify(r.conventions)},"nodes":{`);
  record(
    nodeNames.length,
    (i) => nodeNames[i],
    (i) => toPhasor({ re: vRe[i], im: vIm[i] }),
  );
  push('},"elements":{');
  record(
    r.elementIds.length,
    (k) => r.elementIds[k],
    (k) => {
      const count = currentCount[k];
      const start = currentStart[k];
      const currents = new Array<Phasor>(count);
      for (let c = 0; c < count; c++) currents[c] = toPhasor({ re: cRe[start + c], im: cIm[start + c] });
      return { type: r.elementTypes[k], currents };
    },
  );
  // a primitive-only circuit has no faults
  push(`},"faults":[],"totals":${JSON.stringify(r.totals)},"floating":${JSON.stringify(r.floating)},"flags":${JSON.stringify(r.flags)},"iterations":${JSON.stringify(r.iterations)}}\n`);
  if (buf) write(buf);
  return true;
}
