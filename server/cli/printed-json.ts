/**
 * `--json` (without `--full`) of a primitive-only circuit written straight from arrays: the same
 * bytes as `writeJson(jsonResult(result))` of solve.ts, without building the full results. Two
 * sources, one writer (writePrintedResult): the typed path's printedPrimitiveResultOfText
 * (shared/engine/typed, from the file's text) and, for primitive-only files it declines,
 * printedPrimitiveResults of the general solver's solution (shared/engine/results/printed-primitives.ts).
 * Text is gathered into ~64 K-character chunks before each write.
 *
 * How: each entry is one template string, the numbers written by JavaScript's number-to-text
 * conversion, which is JSON.stringify's (the shortest text that reads back to the same double;
 * a non-finite number as null). Measured against the previous batches of native JSON.stringify
 * over phasor objects: about 40 % less time in this stage at 20 000 buses, and no object per
 * phasor. Same bytes: the keys in jsonResult's order, the phasors from the same toPhasor.
 * Records keep insertion order except for
 * keys that look like array indexes (a JavaScript object lists those first, in numeric order) and
 * "__proto__" (kept as a key in a null-prototype object, but the general path's records are
 * plain objects): a file with such an element id or node name takes the general path.
 */
import { isPrimitiveOnly, printedPrimitiveResults, toPhasor, type PreparedCircuit, type PrimitiveSolution, type PrintedPrimitiveResult } from '../../shared/engine/index.ts';

/** Keys whose place in a plain object differs from insertion order (or that do not become keys). */
const isSpecialKey = (k: string) => k === '__proto__' || /^(0|[1-9]\d{0,9})$/.test(k);

/** A number as JSON.stringify writes it (the shortest text that reads back to it; not finite: null). */
const numText = (x: number): string => (Number.isFinite(x) ? `${x}` : 'null');

/** The JSON text of toPhasor({ re, im }), as JSON.stringify writes it. */
function phasorText(re: number, im: number): string {
  const p = toPhasor({ re, im });
  return `{"re":${numText(p.re)},"im":${numText(p.im)},"mag":${numText(p.mag)},"angleDeg":${numText(p.angleDeg)}}`;
}

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
  for (const n of r.nodeNames) if (isSpecialKey(n)) return false;
  writePrintedResult(r, write, chunkChars);
  return true;
}

/**
 * Write `r` (from printedPrimitiveResults, or printedPrimitiveResultOfText for the typed path) as
 * the `--json` text through `write`. Its ids and node names must not be special keys (see above).
 */
export function writePrintedResult(r: PrintedPrimitiveResult, write: (chunk: string) => void, chunkChars = 1 << 16): void {
  let buf = '';
  const push = (s: string) => {
    buf += s;
    if (buf.length >= chunkChars) {
      write(buf);
      buf = '';
    }
  };
  // the keys in jsonResult's order; each record by a function of its own (see writeNodes)
  push(`{"format":"wyeward-result","version":1,"conventions":${JSON.stringify(r.conventions)},"nodes":{`);
  writeNodes(r, push);
  push('},"elements":{');
  writeElements(r, push);
  // a primitive-only circuit has no faults
  push(`},"faults":[],"totals":${JSON.stringify(r.totals)},"floating":${JSON.stringify(r.floating)},"flags":${JSON.stringify(r.flags)},"iterations":${JSON.stringify(r.iterations)}}\n`);
  if (buf) write(buf);
}

/**
 * The entries of `nodes`. A function of its own, like writeElements: a single run executes each
 * loop once, and one function holding both loops was optimized for the first, then deoptimized
 * at the second for want of type feedback and compiled again.
 */
function writeNodes(r: PrintedPrimitiveResult, push: (s: string) => void): void {
  const { nodeNames, vRe, vIm } = r;
  for (let i = 0; i < nodeNames.length; i++) push(`${i ? ',' : ''}${JSON.stringify(nodeNames[i])}:${phasorText(vRe[i], vIm[i])}`);
}

/** The entries of `elements`: type and currents. */
function writeElements(r: PrintedPrimitiveResult, push: (s: string) => void): void {
  const { elementIds, elementTypes, cRe, cIm, currentStart, currentCount } = r;
  // the type part of each element's text, once per type name
  const typeText = new Map<string, string>();
  for (let k = 0; k < elementIds.length; k++) {
    const type = elementTypes[k];
    let head = typeText.get(type);
    if (head === undefined) typeText.set(type, (head = `:{"type":${JSON.stringify(type)},"currents":[`));
    let text = `${k ? ',' : ''}${JSON.stringify(elementIds[k])}${head}`;
    const start = currentStart[k];
    for (let c = 0; c < currentCount[k]; c++) text += `${c ? ',' : ''}${phasorText(cRe[start + c], cIm[start + c])}`;
    push(`${text}]}`);
  }
}
