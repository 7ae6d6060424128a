/**
 * `--json` (without `--full`) of a primitive-only circuit written straight from the solver's
 * numbers: the same bytes as `writeJson(jsonResult(result))` of solve.ts, without building the
 * full results (see shared/engine/results/printed-primitives.ts) nor an object per element to
 * serialize. Text is gathered into ~1 MB chunks before each write.
 *
 * Same bytes: JSON.stringify writes a finite number as String(x) (and -0 as 0, which String also
 * does), a non-finite one as null; strings are quoted with JSON.stringify itself. Records keep
 * insertion order except for keys that look like array indexes (a JavaScript object lists those
 * first, in numeric order) and "__proto__" (an assignment changes the prototype instead): a file
 * with such an element id or node name takes the general path.
 */
import { isPrimitiveOnly, printedPrimitiveResults, toPhasor, type Cx, type PreparedCircuit, type PrimitiveSolution } from '../../shared/engine/index.ts';

/** Keys whose place in a plain object differs from insertion order (or that do not become keys). */
const isSpecialKey = (k: string) => k === '__proto__' || /^(0|[1-9]\d{0,9})$/.test(k);

const num = (x: number) => (Number.isFinite(x) ? String(x) : 'null');

/** A phasor's JSON text, as JSON.stringify(toPhasor(c)). */
function phasorJson(c: Cx): string {
  const p = toPhasor(c);
  return `{"re":${num(p.re)},"im":${num(p.im)},"mag":${num(p.mag)},"angleDeg":${num(p.angleDeg)}}`;
}

/**
 * Write the `--json` result of `prepared` (solved as `sol`) through `write` and return true, or
 * return false without writing anything when the circuit is not primitive-only or has a special
 * key (the caller then takes the general path).
 */
export function writePrintedPrimitiveJson(prepared: PreparedCircuit, sol: PrimitiveSolution, write: (chunk: string) => void, chunkChars = 1 << 20): boolean {
  if (!isPrimitiveOnly(prepared)) return false;
  for (const e of prepared.expansions) if (isSpecialKey(e.id)) return false;
  for (const n of sol.nodeVolts.keys()) if (isSpecialKey(n)) return false;
  const r = printedPrimitiveResults(prepared, sol);
  let buf = '';
  const push = (s: string) => {
    buf += s;
    if (buf.length >= chunkChars) {
      write(buf);
      buf = '';
    }
  };
  // the keys in jsonResult's order
  push(`{"format":"wyeward-result","version":1,"conventions":${JSON.stringify(r.conventions)},"nodes":{`);
  let first = true;
  for (const [node, v] of r.nodeVolts) {
    push(`${first ? '' : ','}${JSON.stringify(node)}:${phasorJson(v)}`);
    first = false;
  }
  push('},"elements":{');
  for (let k = 0; k < r.elementIds.length; k++) {
    const I = r.elementCurrents[k];
    let currents = '';
    for (let j = 0; j < I.length; j++) currents += (j ? ',' : '') + phasorJson(I[j]);
    push(`${k ? ',' : ''}${JSON.stringify(r.elementIds[k])}:{"type":${JSON.stringify(r.elementTypes[k])},"currents":[${currents}]}`);
  }
  // a primitive-only circuit has no faults
  push(`},"faults":[],"totals":${JSON.stringify(r.totals)},"floating":${JSON.stringify(r.floating)},"flags":${JSON.stringify(r.flags)},"iterations":${JSON.stringify(r.iterations)}}\n`);
  if (buf) write(buf);
  return true;
}
