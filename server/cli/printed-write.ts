/**
 * writePrintedResult: the `--json` text of a PrintedPrimitiveResult (see printed-json.ts for the
 * how and why), in a module of its own that imports no engine module but toPhasor, so the lean
 * bundle of the typed path (solve-lean.ts) stays small.
 */
import { toPhasor } from '../../shared/engine/phasor.ts';
import type { PrintedPrimitiveResult } from '../../shared/engine/results/printed-primitives.ts';

/** A number as JSON.stringify writes it (the shortest text that reads back to it; not finite: null). */
const numText = (x: number): string => (Number.isFinite(x) ? `${x}` : 'null');

/** The JSON text of toPhasor({ re, im }), as JSON.stringify writes it. */
function phasorText(re: number, im: number): string {
  const p = toPhasor({ re, im });
  return `{"re":${numText(p.re)},"im":${numText(p.im)},"mag":${numText(p.mag)},"angleDeg":${numText(p.angleDeg)}}`;
}

/** Text pushed in pieces, handed to `write` in chunks of about `chunkChars`; `end` writes the rest. */
export function chunkedWriter(write: (chunk: string) => void, chunkChars: number): { push: (s: string) => void; end: () => void } {
  let buf = '';
  return {
    push(s) {
      buf += s;
      if (buf.length >= chunkChars) {
        write(buf);
        buf = '';
      }
    },
    end() {
      if (buf) write(buf);
      buf = '';
    },
  };
}

/**
 * Write `r` (from printedPrimitiveResults, or printedPrimitiveResultOfText for the typed path) as
 * the `--json` text through `write`. Its ids and node names must not be special keys (see printed-json.ts).
 */
export function writePrintedResult(r: PrintedPrimitiveResult, write: (chunk: string) => void, chunkChars = 1 << 16): void {
  const { push, end } = chunkedWriter(write, chunkChars);
  // the keys in jsonResult's order; each record by a function of its own (see writeNodes)
  push(`{"format":"wyeward-result","version":1,"conventions":${JSON.stringify(r.conventions)},"nodes":{`);
  writeNodes(r, push);
  push('},"elements":{');
  writeElements(r, push);
  // a primitive-only circuit has no faults
  push(`},"faults":[],"totals":${JSON.stringify(r.totals)},"floating":${JSON.stringify(r.floating)},"flags":${JSON.stringify(r.flags)},"iterations":${JSON.stringify(r.iterations)}}\n`);
  end();
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
