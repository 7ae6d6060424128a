/**
 * writePrintedResult: the `--json` text of a PrintedPrimitiveResult (see printed-json.ts for the
 * why), in a module of its own that imports no engine module but toPhasor, so the lean bundle of
 * the typed path (solve-lean.ts) stays small.
 *
 * How: the text is written as UTF-8 bytes straight into Buffers of ~64 KB, each handed to `write`
 * once full (a new Buffer each time, so a write that keeps it keeps a stable copy). The numbers'
 * text comes from one native JSON.stringify per batch of up to 1 024 numbers in a plain array of
 * doubles, copied out number by number between the array's commas; the rest of the text is
 * copied character by character (ASCII, the usual case) or by Buffer#write for other characters.
 * Why: a number converted by `${x}` is a new heap string (and an entry in V8's number-to-string
 * cache) that the chunk's string then holds, so ~250 000 numbers of a 5 000-bus result made as
 * many short-lived strings and the chunks' rope of pieces had to be flattened and encoded again at
 * every write; JSON.stringify writes a number's digits into its own result with no string per
 * number. Measured (5 000-bus primitive-only file, 8.7 MB printed, CPU of the print alone): see
 * docs/performance-log.md. The same bytes: JSON.stringify writes a number as `${x}` does (the
 * shortest text that reads back to the same double; -0 as 0; not finite: null), phasors from the
 * same toPhasor, names quoted as JSON.stringify quotes them.
 */
import { toPhasor } from '../../shared/engine/phasor.ts';
import type { PrintedPrimitiveResult } from '../../shared/engine/results/printed-primitives.ts';

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

/** Numbers per JSON.stringify call. */
const BATCH = 1024;

/**
 * UTF-8 bytes gathered into Buffers of `size` bytes (larger when one piece needs it), each handed
 * to `write` when the next piece does not fit, the last by end(). Its methods take and return no
 * objects; the position lives in the instance.
 */
class ByteWriter {
  private buf: Buffer;
  private o = 0;
  /** The numbers' text (from JSON.stringify of a batch) and the position of the next number in it. */
  private nums = '';
  private at = 0;

  constructor(
    private readonly write: (chunk: Uint8Array) => void,
    private readonly size: number,
  ) {
    this.buf = Buffer.allocUnsafe(size);
  }

  /** Room for n more bytes: the full buffer is handed on and a new one started. */
  private room(n: number): void {
    if (this.o + n <= this.buf.length) return;
    if (this.o > 0) this.write(this.buf.subarray(0, this.o));
    this.buf = Buffer.allocUnsafe(Math.max(this.size, n));
    this.o = 0;
  }

  /** The text s[from, to) as UTF-8. */
  text(s: string, from = 0, to = s.length): void {
    this.room(3 * (to - from)); // a UTF-16 code unit is at most 3 bytes of UTF-8
    const buf = this.buf;
    let o = this.o;
    for (let i = from; i < to; i++) {
      const c = s.charCodeAt(i);
      if (c < 0x80) buf[o++] = c;
      else {
        // the rest through Buffer's UTF-8 encoder (surrogate pairs kept together)
        o += buf.write(i === 0 && to === s.length ? s : s.slice(i, to), o, 'utf8');
        break;
      }
    }
    this.o = o;
  }

  /** A JSON string literal of `s`, as JSON.stringify(s) writes it. */
  quoted(s: string): void {
    const n = s.length;
    this.room(n + 2);
    const buf = this.buf;
    let o = this.o;
    buf[o++] = 34;
    for (let i = 0; i < n; i++) {
      const c = s.charCodeAt(i);
      // printable ASCII other than " and \ is written as it is; anything else by JSON.stringify
      if (c < 0x20 || c > 0x7e || c === 34 || c === 92) return this.text(JSON.stringify(s));
      buf[o++] = c;
    }
    buf[o++] = 34;
    this.o = o;
  }

  /** Start reading numbers from `text`, the JSON.stringify of an array of numbers. */
  numbers(text: string): void {
    this.nums = text;
    this.at = 1;
  }

  /** The next number of the current batch, as JSON.stringify wrote it. */
  num(): void {
    const t = this.nums;
    let i = this.at;
    this.room(32); // a JSON number from a double is at most 25 characters
    const buf = this.buf;
    let o = this.o;
    for (;;) {
      const c = t.charCodeAt(i++);
      if (c === 44 || c === 93) break; // , or ]
      buf[o++] = c;
    }
    this.at = i;
    this.o = o;
  }

  end(): void {
    if (this.o > 0) this.write(this.buf.subarray(0, this.o));
    this.o = 0;
  }
}

/**
 * Write `r` (from printedPrimitiveResults, or printedPrimitiveResultOfText for the typed path) as
 * the `--json` text (UTF-8) through `write`, in chunks of about `chunkBytes`. Its ids and node
 * names must not be special keys (see printed-json.ts).
 */
export function writePrintedResult(r: PrintedPrimitiveResult, write: (chunk: Uint8Array) => void, chunkBytes = 1 << 16): void {
  const w = new ByteWriter(write, chunkBytes);
  // the keys in jsonResult's order; each record by a function of its own (see writeNodes)
  w.text(`{"format":"wyeward-result","version":1,"conventions":${JSON.stringify(r.conventions)},"nodes":{`);
  writeNodes(r, w);
  w.text('},"elements":{');
  writeElements(r, w);
  // a primitive-only circuit has no faults
  w.text(`},"faults":[],"totals":${JSON.stringify(r.totals)},"floating":${JSON.stringify(r.floating)},"flags":${JSON.stringify(r.flags)},"iterations":${JSON.stringify(r.iterations)}}\n`);
  w.end();
}

/** The text of one phasor whose four numbers are next in the writer's batch. */
function phasor(w: ByteWriter): void {
  w.text('{"re":');
  w.num();
  w.text(',"im":');
  w.num();
  w.text(',"mag":');
  w.num();
  w.text(',"angleDeg":');
  w.num();
  w.text('}');
}

/** toPhasor({ re, im })'s four numbers into nums[at …]. */
function putPhasor(nums: number[], at: number, re: number, im: number): void {
  const p = toPhasor({ re, im });
  nums[at] = p.re;
  nums[at + 1] = p.im;
  nums[at + 2] = p.mag;
  nums[at + 3] = p.angleDeg;
}

/**
 * The entries of `nodes`. A function of its own, like writeElements: a single run executes each
 * loop once, and one function holding both loops was optimized for the first, then deoptimized
 * at the second for want of type feedback and compiled again.
 */
function writeNodes(r: PrintedPrimitiveResult, w: ByteWriter): void {
  const { nodeNames, vRe, vIm } = r;
  const n = nodeNames.length;
  const per = BATCH / 4;
  const nums: number[] = [];
  for (let i0 = 0; i0 < n; i0 += per) {
    const i1 = Math.min(n, i0 + per);
    nums.length = 4 * (i1 - i0);
    for (let i = i0; i < i1; i++) putPhasor(nums, 4 * (i - i0), vRe[i], vIm[i]);
    w.numbers(JSON.stringify(nums));
    for (let i = i0; i < i1; i++) {
      if (i) w.text(',');
      w.quoted(nodeNames[i]);
      w.text(':');
      phasor(w);
    }
  }
}

/** The entries of `elements`: type and currents. */
function writeElements(r: PrintedPrimitiveResult, w: ByteWriter): void {
  const { elementIds, elementTypes, cRe, cIm, currentStart, currentCount } = r;
  const n = elementIds.length;
  // the type part of each element's text, once per type name
  const typeText = new Map<string, string>();
  const nums: number[] = [];
  let k0 = 0;
  while (k0 < n) {
    // the next elements whose currents fill a batch (at least one element)
    let k1 = k0;
    let count = 0;
    do count += currentCount[k1++];
    while (k1 < n && 4 * (count + currentCount[k1]) <= BATCH);
    nums.length = 4 * count;
    let at = 0;
    for (let k = k0; k < k1; k++) {
      const start = currentStart[k];
      for (let c = 0; c < currentCount[k]; c++, at += 4) putPhasor(nums, at, cRe[start + c], cIm[start + c]);
    }
    w.numbers(JSON.stringify(nums));
    for (let k = k0; k < k1; k++) {
      const type = elementTypes[k];
      let head = typeText.get(type);
      if (head === undefined) typeText.set(type, (head = `:{"type":${JSON.stringify(type)},"currents":[`));
      if (k) w.text(',');
      w.quoted(elementIds[k]);
      w.text(head);
      for (let c = 0; c < currentCount[k]; c++) {
        if (c) w.text(',');
        phasor(w);
      }
      w.text(']}');
    }
    k0 = k1;
  }
}
