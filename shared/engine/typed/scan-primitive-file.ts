/**
 * Single-pass reading of a primitive-only circuit file, straight from its JSON text into typed
 * arrays: per element a kind code, two node numbers and one complex value; node names interned
 * once. No parsed JSON tree, no element objects (on a 42 000-impedance file JSON.parse, the zod
 * and hand checks and the expansion built ~10⁵ objects per stage and most of the CLI's garbage).
 *
 * What it accepts (anything else returns undefined, and the caller takes the general path, which
 * then gives its own result or its own error message): a top-level object with `format`,
 * `version`, `frequencyHz`, `elements` and optionally `name`, `description`, `sequence`; elements
 * that are `impedance`, `currentSource` or `voltageSource` without `seriesOhms`, each with exactly
 * its keys; complex values as a number, `{re, im}` or `{mag, angleDeg}`; strings without escapes;
 * no repeated key, no repeated element id. It also returns undefined wherever the general path
 * would reject the file (zero or too small impedance, a node joined to itself, a value out of
 * the solver's range, an empty name), so an accepted file is one the general path accepts, with
 * the same values: numbers are read to the same double as JSON.parse (exact decimal conversion,
 * see readNumber), complex forms converted by the same functions (toCx's rules, polar).
 * Ids and node names that a JavaScript object would not keep in insertion order (array-index-like
 * names, "__proto__") are refused too: the printed JSON writes records in the solver's order.
 */
import { EARTH } from '../types.ts';
import { polar } from '../phasor.ts';
import { MAX_MAGNITUDE, MIN_IMPEDANCE } from '../solver/validate.ts';

/** Kind codes of a scanned element. */
export const S_IMPEDANCE = 0;
export const S_VOLTAGE_SOURCE = 1;
export const S_CURRENT_SOURCE = 2;

/** The elements of a primitive-only file in typed arrays (element k in file order). */
export interface ScannedPrimitives {
  sequence: 'ABC' | 'ACB';
  /** Number of elements. */
  count: number;
  ids: string[];
  /** S_IMPEDANCE, S_VOLTAGE_SOURCE or S_CURRENT_SOURCE. */
  kind: Uint8Array;
  /** Node numbers of the first and second terminal (from/plus, to/minus); earth is node 0. */
  n1: Int32Array;
  n2: Int32Array;
  /** Value: ohms, volts or amps. */
  re: Float64Array;
  im: Float64Array;
  /** Node names by number (earth first, then in order of first use by the elements' terminals). */
  nodeNames: string[];
}

/** Thrown inside the scanner when the text is not of the accepted shape; never escapes it. */
class NotAccepted {}
const NO = new NotAccepted();

/** Exact powers of ten as doubles (10^0 … 10^22 are representable exactly). */
const POW10 = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

/** Names whose place in a JavaScript object is not their insertion order, or that are not kept as keys. */
const isSpecialKey = (k: string) => {
  const c = k.charCodeAt(0);
  return ((c >= 48 && c <= 57) || c === 95) && (k === '__proto__' || /^(0|[1-9]\d{0,9})$/.test(k));
};

/** Keys of an element, as bits. */
const F_TYPE = 1;
const F_ID = 2;
const F_FROM = 4;
const F_TO = 8;
const F_PLUS = 16;
const F_MINUS = 32;
const F_OHMS = 64;
const F_VOLTS = 128;
const F_AMPS = 256;
const NEEDS = [F_TYPE | F_ID | F_FROM | F_TO | F_OHMS, F_TYPE | F_ID | F_PLUS | F_MINUS | F_VOLTS, F_TYPE | F_ID | F_FROM | F_TO | F_AMPS];

/**
 * The file `text` as typed arrays, or undefined when it is not a primitive-only file of the
 * accepted shape (see the module comment), or when the general path would reject it.
 */
export function scanPrimitiveFile(text: string): ScannedPrimitives | undefined {
  try {
    return scan(text);
  } catch (e) {
    if (e === NO) return undefined;
    throw e;
  }
}

// The scanner keeps its position in a local variable of scan() and calls small top-level
// functions that take and return positions (a position shared by closures is a context slot,
// which V8 cannot keep in a register: measured ~2× slower). Results beyond a position go
// through the module-level slots below.

/** Position after JSON whitespace at p. */
function ws(s: string, p: number): number {
  for (;;) {
    const c = s.charCodeAt(p);
    if (c === 32 || c === 10 || c === 13 || c === 9) p++;
    else return p;
  }
}

/** Position after the character c at p (after whitespace), or not accepted. */
function expect(s: string, p: number, c: number): number {
  p = ws(s, p);
  if (s.charCodeAt(p) !== c) throw NO;
  return p + 1;
}

/** True when the text at p is the string literal `"w"`. */
function isWord(s: string, p: number, w: string): boolean {
  return s.charCodeAt(p) === 34 && s.charCodeAt(p + 1 + w.length) === 34 && s.startsWith(w, p + 1);
}

/** The string starting at p (its opening quote), without escapes or control characters: its end (the closing quote) and hash in STR_END, STR_HASH. */
let STR_END = 0;
let STR_HASH = 0;
function scanString(s: string, p: number): void {
  if (s.charCodeAt(p) !== 34) throw NO;
  let h = 0x811c9dc5 | 0;
  for (p++; ; p++) {
    const c = s.charCodeAt(p);
    if (c === 34) break;
    if (c === 92 || !(c >= 32)) throw NO; // escapes, control characters, end of text (NaN)
    h = Math.imul(h ^ c, 0x01000193);
  }
  STR_END = p;
  STR_HASH = h;
}

/** The hash scanString computes (FNV-1a on UTF-16 code units). */
function hashOfText(name: string): number {
  let h = 0x811c9dc5 | 0;
  for (let i = 0; i < name.length; i++) h = Math.imul(h ^ name.charCodeAt(i), 0x01000193);
  return h;
}

/**
 * A JSON number at p (after whitespace), read to the double JSON.parse gives; its end in NUM_END.
 * The decimal significand as an integer m < 10^15 and a power of ten |e| ≤ 22 are both exact
 * doubles, so m·10^e or m/10^−e is one correctly rounded operation (Clinger's fast path); other
 * numbers go through Number() of their text, which rounds correctly too.
 */
let NUM_END = 0;
function readNumber(s: string, p: number): number {
  p = ws(s, p);
  const start = p;
  let neg = false;
  if (s.charCodeAt(p) === 45) {
    neg = true;
    p++;
  }
  let m = 0;
  let digits = 0; // significant digits seen
  let exp = 0;
  let c = s.charCodeAt(p);
  if (c === 48) {
    c = s.charCodeAt(++p);
    if (c >= 48 && c <= 57) throw NO; // leading zero
  } else if (c >= 49 && c <= 57) {
    do {
      if (digits < 15) m = m * 10 + (c - 48);
      else exp++;
      digits++;
      c = s.charCodeAt(++p);
    } while (c >= 48 && c <= 57);
  } else throw NO;
  if (c === 46) {
    c = s.charCodeAt(++p);
    if (!(c >= 48 && c <= 57)) throw NO;
    do {
      if (digits === 0 && c === 48) exp--; // leading zeros of a fraction
      else {
        if (digits < 15) {
          m = m * 10 + (c - 48);
          exp--;
        }
        digits++;
      }
      c = s.charCodeAt(++p);
    } while (c >= 48 && c <= 57);
  }
  if (c === 101 || c === 69) {
    c = s.charCodeAt(++p);
    let eneg = false;
    if (c === 43 || c === 45) {
      eneg = c === 45;
      c = s.charCodeAt(++p);
    }
    if (!(c >= 48 && c <= 57)) throw NO;
    let e = 0;
    do {
      if (e < 100000) e = e * 10 + (c - 48);
      c = s.charCodeAt(++p);
    } while (c >= 48 && c <= 57);
    exp += eneg ? -e : e;
  }
  NUM_END = p;
  let v: number;
  if (digits <= 15 && m === 0) v = neg ? -0 : 0;
  else if (digits <= 15 && exp >= 0 && exp <= 22) v = neg ? -(m * POW10[exp]) : m * POW10[exp];
  else if (digits <= 15 && exp < 0 && exp >= -22) v = neg ? -(m / POW10[-exp]) : m / POW10[-exp];
  else v = Number(s.slice(start, p));
  if (!Number.isFinite(v)) throw NO;
  return v;
}

/** A complex value at p (number, {re, im} or {mag ≥ 0, angleDeg}): CX_RE, CX_IM, its end in NUM_END. */
let CX_RE = 0;
let CX_IM = 0;
function readComplex(s: string, p: number): void {
  p = ws(s, p);
  if (s.charCodeAt(p) !== 123) {
    CX_RE = readNumber(s, p);
    CX_IM = 0;
    return;
  }
  p++;
  // parts: 1 re, 2 im, 4 mag, 8 angleDeg
  let seen = 0;
  let re = 0;
  let im = 0;
  let mag = 0;
  let ang = 0;
  for (;;) {
    p = ws(s, p);
    let bit = 0;
    if (isWord(s, p, 're')) bit = 1;
    else if (isWord(s, p, 'im')) bit = 2;
    else if (isWord(s, p, 'mag')) bit = 4;
    else if (isWord(s, p, 'angleDeg')) bit = 8;
    if (bit === 0 || seen & bit) throw NO;
    seen |= bit;
    p = expect(s, p + (bit === 1 || bit === 2 ? 4 : bit === 4 ? 5 : 10), 58);
    const v = readNumber(s, p);
    p = ws(s, NUM_END);
    if (bit === 1) re = v;
    else if (bit === 2) im = v;
    else if (bit === 4) mag = v;
    else ang = v;
    const c = s.charCodeAt(p++);
    if (c === 125) break;
    if (c !== 44) throw NO;
  }
  NUM_END = p;
  if (seen === 3) {
    CX_RE = re;
    CX_IM = im;
  } else if (seen === 12 && mag >= 0) {
    const z = polar(mag, ang);
    CX_RE = z.re;
    CX_IM = z.im;
  } else throw NO;
}

/**
 * Node names interned from the text without slicing a string per use (a node is named by ~4–8
 * elements): an open-addressing table on the names' hashes, checked against the names.
 */
class NodeTable {
  names: string[] = [];
  private hashes = new Int32Array(1024);
  private size = 1 << 12;
  private table = new Int32Array(this.size); // node number + 1; 0: empty

  constructor(private readonly s: string) {}

  /** The number of the node named by the text from..to with hash h (a new number for a new name). */
  node(from: number, to: number, h: number): number {
    const len = to - from;
    const mask = this.size - 1;
    for (let q = h & mask; ; q = (q + 1) & mask) {
      const t = this.table[q];
      if (t === 0) break;
      if (this.hashes[t - 1] === h) {
        const name = this.names[t - 1];
        if (name.length === len && this.s.startsWith(name, from)) return t - 1;
      }
    }
    return this.add(this.s.slice(from, to), h);
  }

  add(name: string, h: number): number {
    if (isSpecialKey(name)) throw NO;
    const i = this.names.length;
    this.names.push(name);
    if (i === this.hashes.length) {
      const h2 = new Int32Array(2 * i);
      h2.set(this.hashes);
      this.hashes = h2;
    }
    this.hashes[i] = h;
    if (2 * this.names.length > this.size) {
      this.size *= 4;
      this.table = new Int32Array(this.size);
      for (let j = 0; j < this.names.length; j++) this.place(this.hashes[j], j);
    } else this.place(h, i);
    return i;
  }

  private place(h: number, i: number): void {
    const mask = this.size - 1;
    let q = h & mask;
    while (this.table[q] !== 0) q = (q + 1) & mask;
    this.table[q] = i + 1;
  }
}

/**
 * One element object at p (after whitespace): its keys in any order, its parts into the EL_*
 * slots (type, the keys seen, the bounds and hashes of its id and node names, its value); returns
 * the position after its closing brace. A function of its own rather than a loop body of scan: a
 * small function is compiled early by its call count, which matters in a single run of the CLI.
 */
let EL_TYPE = -1;
let EL_SEEN = 0;
let EL_ID_FROM = 0;
let EL_ID_TO = 0;
let EL_A_FROM = 0;
let EL_A_TO = 0;
let EL_A_HASH = 0;
let EL_B_FROM = 0;
let EL_B_TO = 0;
let EL_B_HASH = 0;
let EL_RE = 0;
let EL_IM = 0;
function scanElement(s: string, p: number): number {
  p = expect(s, p, 123);
  let seen = 0;
  let type = -1;
  let zr = 0;
  let zi = 0;
  for (;;) {
    p = ws(s, p);
    if (s.charCodeAt(p) !== 34) throw NO;
    let key = 0;
    let keyLen = 0;
    // dispatch on the key's first letter, then check the whole key
    switch (s.charCodeAt(p + 1)) {
      case 116: // t
        if (isWord(s, p, 'type')) {
          key = F_TYPE;
          keyLen = 4;
        } else if (isWord(s, p, 'to')) {
          key = F_TO;
          keyLen = 2;
        }
        break;
      case 105: // i
        if (isWord(s, p, 'id')) {
          key = F_ID;
          keyLen = 2;
        }
        break;
      case 102: // f
        if (isWord(s, p, 'from')) {
          key = F_FROM;
          keyLen = 4;
        }
        break;
      case 112: // p
        if (isWord(s, p, 'plus')) {
          key = F_PLUS;
          keyLen = 4;
        }
        break;
      case 109: // m
        if (isWord(s, p, 'minus')) {
          key = F_MINUS;
          keyLen = 5;
        }
        break;
      case 111: // o
        if (isWord(s, p, 'ohms')) {
          key = F_OHMS;
          keyLen = 4;
        }
        break;
      case 118: // v
        if (isWord(s, p, 'volts')) {
          key = F_VOLTS;
          keyLen = 5;
        }
        break;
      case 97: // a
        if (isWord(s, p, 'amps')) {
          key = F_AMPS;
          keyLen = 4;
        }
        break;
    }
    if (key === 0 || seen & key) throw NO; // any other key (seriesOhms, closed, …), or a repeated one: the general path
    seen |= key;
    p = ws(s, expect(s, p + keyLen + 2, 58));
    if (key === F_TYPE) {
      if (isWord(s, p, 'impedance')) {
        type = S_IMPEDANCE;
        p = p + 11;
      } else if (isWord(s, p, 'voltageSource')) {
        type = S_VOLTAGE_SOURCE;
        p = p + 15;
      } else if (isWord(s, p, 'currentSource')) {
        type = S_CURRENT_SOURCE;
        p = p + 15;
      } else throw NO;
    } else if (key === F_ID) {
      scanString(s, p);
      EL_ID_FROM = p + 1;
      EL_ID_TO = STR_END;
      p = STR_END + 1;
    } else if (key & (F_FROM | F_PLUS)) {
      scanString(s, p);
      EL_A_FROM = p + 1;
      EL_A_TO = STR_END;
      EL_A_HASH = STR_HASH;
      p = STR_END + 1;
    } else if (key & (F_TO | F_MINUS)) {
      scanString(s, p);
      EL_B_FROM = p + 1;
      EL_B_TO = STR_END;
      EL_B_HASH = STR_HASH;
      p = STR_END + 1;
    } else {
      readComplex(s, p);
      zr = CX_RE;
      zi = CX_IM;
      p = NUM_END;
    }
    p = ws(s, p);
    const c = s.charCodeAt(p++);
    if (c === 125) break;
    if (c !== 44) throw NO;
  }
  EL_TYPE = type;
  EL_SEEN = seen;
  EL_RE = zr;
  EL_IM = zi;
  return p;
}

function scan(s: string): ScannedPrimitives {
  const len = s.length;
  // growable element arrays
  let cap = Math.max(64, (len / 80) | 0);
  let kind = new Uint8Array(cap);
  let n1 = new Int32Array(cap);
  let n2 = new Int32Array(cap);
  let vre = new Float64Array(cap);
  let vim = new Float64Array(cap);
  const ids: string[] = [];
  const idSet = new Set<string>();
  const nodes = new NodeTable(s);
  nodes.add(EARTH, hashOfText(EARTH));
  let count = 0;
  let sequence: 'ABC' | 'ACB' = 'ABC';
  let top = 0;
  let p = expect(s, 0, 123);
  for (;;) {
    p = ws(s, p);
    let bit = 0;
    if (isWord(s, p, 'elements')) {
      bit = 8;
      p = expect(s, expect(s, p + 10, 58), 91);
      p = ws(s, p);
      if (s.charCodeAt(p) === 93) p++;
      else
        for (;;) {
          p = scanElement(s, p);
          const type = EL_TYPE;
          const seen = EL_SEEN;
          const idFrom = EL_ID_FROM;
          const idTo = EL_ID_TO;
          const aFrom = EL_A_FROM;
          const aTo = EL_A_TO;
          const aH = EL_A_HASH;
          const bFrom = EL_B_FROM;
          const bTo = EL_B_TO;
          const bH = EL_B_HASH;
          const zr = EL_RE;
          const zi = EL_IM;
          if (type < 0 || seen !== NEEDS[type]) throw NO;
          // what the general path rejects, or orders differently: its message, not ours
          if (idTo === idFrom || aTo === aFrom || bTo === bFrom) throw NO; // empty id or node name
          if (aH === bH && aTo - aFrom === bTo - bFrom && s.startsWith(s.slice(aFrom, aTo), bFrom)) throw NO; // a node joined to itself
          if (!(Math.abs(zr) <= MAX_MAGNITUDE && Math.abs(zi) <= MAX_MAGNITUDE)) throw NO;
          if (type === S_IMPEDANCE && !(Math.max(Math.abs(zr), Math.abs(zi)) >= MIN_IMPEDANCE)) throw NO;
          const id = s.slice(idFrom, idTo);
          const known = idSet.size;
          idSet.add(id); // one lookup: a repeated id leaves the size as it was
          if (idSet.size === known || isSpecialKey(id)) throw NO;
          if (count === cap) {
            cap *= 2;
            [kind, n1, n2, vre, vim] = [grown(kind, new Uint8Array(cap)), grown(n1, new Int32Array(cap)), grown(n2, new Int32Array(cap)), grown(vre, new Float64Array(cap)), grown(vim, new Float64Array(cap))];
          }
          ids.push(id);
          kind[count] = type;
          n1[count] = nodes.node(aFrom, aTo, aH);
          n2[count] = nodes.node(bFrom, bTo, bH);
          vre[count] = zr;
          vim[count] = zi;
          count++;
          p = ws(s, p);
          const c = s.charCodeAt(p++);
          if (c === 93) break;
          if (c !== 44) throw NO;
        }
    } else if (isWord(s, p, 'format')) {
      bit = 1;
      p = ws(s, expect(s, p + 8, 58));
      if (!isWord(s, p, 'wyeward-circuit')) throw NO;
      p += 17;
    } else if (isWord(s, p, 'version')) {
      bit = 2;
      if (readNumber(s, expect(s, p + 9, 58)) !== 1) throw NO;
      p = NUM_END;
    } else if (isWord(s, p, 'frequencyHz')) {
      bit = 4;
      if (!(readNumber(s, expect(s, p + 13, 58)) > 0)) throw NO;
      p = NUM_END;
    } else if (isWord(s, p, 'name') || isWord(s, p, 'description')) {
      bit = s.charCodeAt(p + 1) === 110 ? 16 : 32;
      p = ws(s, expect(s, p + (bit === 16 ? 6 : 13), 58));
      scanString(s, p);
      p = STR_END + 1;
    } else if (isWord(s, p, 'sequence')) {
      bit = 64;
      p = ws(s, expect(s, p + 10, 58));
      if (isWord(s, p, 'ABC')) sequence = 'ABC';
      else if (isWord(s, p, 'ACB')) sequence = 'ACB';
      else throw NO;
      p += 5;
    } else throw NO; // buses, limits, cases, anything else: the general path
    if (top & bit) throw NO;
    top |= bit;
    p = ws(s, p);
    const c = s.charCodeAt(p++);
    if (c === 125) break;
    if (c !== 44) throw NO;
  }
  p = ws(s, p);
  if (p !== len || (top & 15) !== 15) throw NO;
  return { sequence, count, ids, kind: kind.subarray(0, count), n1: n1.subarray(0, count), n2: n2.subarray(0, count), re: vre.subarray(0, count), im: vim.subarray(0, count), nodeNames: nodes.names };
}

/** `to` with the contents of the shorter `from` copied in. */
function grown<T extends Uint8Array | Int32Array | Float64Array>(from: T, to: T): T {
  to.set(from);
  return to;
}
