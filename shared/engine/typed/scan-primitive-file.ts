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
  /** Node names by number (earth first, then in order of first use by the elements' terminals), and the inverse. */
  nodeNames: string[];
  nodeIndex: Map<string, number>;
}

/** The hash nodeRef computes while reading a name (FNV-1a on UTF-16 code units). */
function hashOfText(name: string): number {
  let h = 0x811c9dc5 | 0;
  for (let i = 0; i < name.length; i++) h = Math.imul(h ^ name.charCodeAt(i), 0x01000193);
  return h;
}

/** Thrown inside the scanner when the text is not of the accepted shape; never escapes it. */
class NotAccepted {}
const NO = new NotAccepted();

/** Exact powers of ten as doubles (10^0 … 10^22 are representable exactly). */
const POW10 = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

/** Names whose place in a JavaScript object is not their insertion order, or that are not kept as keys. */
const isSpecialKey = (k: string) => k === '__proto__' || /^(0|[1-9]\d{0,9})$/.test(k);

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

function scan(s: string): ScannedPrimitives {
  const len = s.length;
  let p = 0;

  const ws = (): void => {
    for (;;) {
      const c = s.charCodeAt(p);
      if (c === 32 || c === 10 || c === 13 || c === 9) p++;
      else return;
    }
  };
  const expect = (c: number): void => {
    ws();
    if (s.charCodeAt(p) !== c) throw NO;
    p++;
  };
  /** A string without escapes or control characters; p after its closing quote. */
  const str = (): string => {
    ws();
    if (s.charCodeAt(p) !== 34) throw NO;
    const start = ++p;
    for (;;) {
      const c = s.charCodeAt(p);
      if (c === 34) break;
      if (c === 92 || c < 32 || p >= len) throw NO; // escapes, control characters, end of text (NaN < 32 is false)
      p++;
    }
    return s.slice(start, p++);
  };
  /** True (and p past it) when the text at p is the string literal `"word"`. */
  const word = (w: string): boolean => {
    if (s.charCodeAt(p) === 34 && s.startsWith(w, p + 1) && s.charCodeAt(p + 1 + w.length) === 34) {
      p += w.length + 2;
      return true;
    }
    return false;
  };
  /**
   * A JSON number, read to the double JSON.parse gives: the decimal significand as an integer
   * m < 10^15 and a power of ten |e| ≤ 22 are both exact doubles, so m·10^e or m/10^−e is one
   * correctly rounded operation (Clinger's fast path); other numbers go through Number() of
   * their text, which rounds correctly too.
   */
  const readNumber = (): number => {
    ws();
    const start = p;
    let neg = false;
    if (s.charCodeAt(p) === 45) {
      neg = true;
      p++;
    }
    let m = 0;
    let digits = 0; // significant digits in m
    let exp = 0;
    let c = s.charCodeAt(p);
    if (c === 48) {
      p++;
      c = s.charCodeAt(p);
      if (c >= 48 && c <= 57) throw NO; // leading zero
    } else if (c >= 49 && c <= 57) {
      do {
        if (digits < 15) {
          m = m * 10 + (c - 48);
          digits++;
        } else {
          exp++;
          digits++;
        }
        c = s.charCodeAt(++p);
      } while (c >= 48 && c <= 57);
    } else throw NO;
    if (c === 46) {
      c = s.charCodeAt(++p);
      if (!(c >= 48 && c <= 57)) throw NO;
      do {
        if (digits === 0 && c === 48) exp--; // leading zeros of a fraction
        else if (digits < 15) {
          m = m * 10 + (c - 48);
          digits++;
          exp--;
        } else digits++;
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
    let v: number;
    if (digits <= 15 && m === 0) v = neg ? -0 : 0;
    else if (digits <= 15 && exp >= 0 && exp <= 22) v = neg ? -(m * POW10[exp]) : m * POW10[exp];
    else if (digits <= 15 && exp < 0 && exp >= -22) v = neg ? -(m / POW10[-exp]) : m / POW10[-exp];
    else v = Number(s.slice(start, p));
    if (!Number.isFinite(v)) throw NO;
    return v;
  };
  /** A complex value (number, {re, im} or {mag ≥ 0, angleDeg}) into cre/cim. */
  let cre = 0;
  let cim = 0;
  const complex = (): void => {
    ws();
    if (s.charCodeAt(p) !== 123) {
      cre = readNumber();
      cim = 0;
      return;
    }
    p++;
    let re: number | undefined;
    let im: number | undefined;
    let mag: number | undefined;
    let ang: number | undefined;
    let n = 0;
    ws();
    if (s.charCodeAt(p) === 125) throw NO;
    for (;;) {
      ws();
      if (word('re') && re === undefined) re = (expect(58), readNumber());
      else if (word('im') && im === undefined) im = (expect(58), readNumber());
      else if (word('mag') && mag === undefined) mag = (expect(58), readNumber());
      else if (word('angleDeg') && ang === undefined) ang = (expect(58), readNumber());
      else throw NO;
      n++;
      ws();
      const c = s.charCodeAt(p++);
      if (c === 125) break;
      if (c !== 44) throw NO;
    }
    if (n !== 2) throw NO;
    if (re !== undefined && im !== undefined) {
      cre = re;
      cim = im;
    } else if (mag !== undefined && ang !== undefined && mag >= 0) {
      const z = polar(mag, ang);
      cre = z.re;
      cim = z.im;
    } else throw NO;
  };

  // growable element arrays
  let cap = Math.max(64, (len / 80) | 0);
  let kind = new Uint8Array(cap);
  let n1 = new Int32Array(cap);
  let n2 = new Int32Array(cap);
  let vre = new Float64Array(cap);
  let vim = new Float64Array(cap);
  const grow = () => {
    cap *= 2;
    const k2 = new Uint8Array(cap);
    k2.set(kind);
    kind = k2;
    const a2 = new Int32Array(cap);
    a2.set(n1);
    n1 = a2;
    const b2 = new Int32Array(cap);
    b2.set(n2);
    n2 = b2;
    const r2 = new Float64Array(cap);
    r2.set(vre);
    vre = r2;
    const i2 = new Float64Array(cap);
    i2.set(vim);
    vim = i2;
  };
  const ids: string[] = [];
  const idSet = new Set<string>();
  // Node names interned from the text without slicing a string per use (a node is named by ~4–8
  // elements): an open-addressing table on a hash of the characters, checked against the names.
  const nodeNames: string[] = [];
  let tabSize = 1 << 12;
  let table = new Int32Array(tabSize); // node number + 1; 0: empty
  let nodeHash = new Int32Array(1024);
  const place = (h: number, i: number): void => {
    let q = h & (tabSize - 1);
    while (table[q] !== 0) q = (q + 1) & (tabSize - 1);
    table[q] = i + 1;
  };
  const addNode = (name: string, h: number): number => {
    if (isSpecialKey(name)) throw NO;
    const i = nodeNames.length;
    nodeNames.push(name);
    if (i === nodeHash.length) {
      const h2 = new Int32Array(2 * i);
      h2.set(nodeHash);
      nodeHash = h2;
    }
    nodeHash[i] = h;
    if (2 * nodeNames.length > tabSize) {
      tabSize *= 4;
      table = new Int32Array(tabSize);
      for (let j = 0; j < nodeNames.length; j++) place(nodeHash[j], j);
    } else place(h, i);
    return i;
  };
  /** The number of the node named by the text from..to (a new number for a new name). */
  const node = (from: number, to: number, h: number): number => {
    const len = to - from;
    for (let q = h & (tabSize - 1); ; q = (q + 1) & (tabSize - 1)) {
      const t = table[q];
      if (t === 0) break;
      const name = nodeNames[t - 1];
      if (nodeHash[t - 1] === h && name.length === len && s.startsWith(name, from)) return t - 1;
    }
    return addNode(s.slice(from, to), h);
  };
  addNode(EARTH, hashOfText(EARTH));
  /** A node name's string in the text: its bounds and hash in nodeFrom/nodeTo/nodeH (no escapes, non-empty). */
  let nodeFrom = 0;
  let nodeTo = 0;
  let nodeH = 0;
  const nodeRef = (): void => {
    ws();
    if (s.charCodeAt(p) !== 34) throw NO;
    const start = ++p;
    let h = 0x811c9dc5 | 0;
    for (;;) {
      const c = s.charCodeAt(p);
      if (c === 34) break;
      if (c === 92 || c < 32 || p >= len) throw NO;
      h = Math.imul(h ^ c, 0x01000193);
      p++;
    }
    if (p === start) throw NO; // an empty name: the general path's message
    nodeFrom = start;
    nodeTo = p++;
    nodeH = h;
  };
  let count = 0;

  const element = (): void => {
    expect(123);
    let seen = 0;
    let type = -1;
    let id = '';
    let aFrom = 0;
    let aTo = 0;
    let aH = 0;
    let bFrom = 0;
    let bTo = 0;
    let bH = 0;
    let zr = 0;
    let zi = 0;
    for (;;) {
      ws();
      let bit = 0;
      if (s.charCodeAt(p) !== 34) throw NO;
      // dispatch on the key's first letter, then check the whole key
      switch (s.charCodeAt(p + 1)) {
        case 116: // t
          if (word('type')) {
            bit = F_TYPE;
            expect(58);
            ws();
            if (word('impedance')) type = S_IMPEDANCE;
            else if (word('voltageSource')) type = S_VOLTAGE_SOURCE;
            else if (word('currentSource')) type = S_CURRENT_SOURCE;
            else throw NO;
          } else if (word('to')) bit = F_TO;
          break;
        case 105: // i
          if (word('id')) {
            bit = F_ID;
            expect(58);
            id = str();
          }
          break;
        case 102: // f
          if (word('from')) bit = F_FROM;
          break;
        case 112: // p
          if (word('plus')) bit = F_PLUS;
          break;
        case 109: // m
          if (word('minus')) bit = F_MINUS;
          break;
        case 111: // o
          if (word('ohms')) bit = F_OHMS;
          break;
        case 118: // v
          if (word('volts')) bit = F_VOLTS;
          break;
        case 97: // a
          if (word('amps')) bit = F_AMPS;
          break;
      }
      if (bit === 0) throw NO; // any other key (seriesOhms, closed, …): the general path
      if (bit & (F_FROM | F_PLUS)) {
        expect(58);
        nodeRef();
        aFrom = nodeFrom;
        aTo = nodeTo;
        aH = nodeH;
      } else if (bit & (F_TO | F_MINUS)) {
        expect(58);
        nodeRef();
        bFrom = nodeFrom;
        bTo = nodeTo;
        bH = nodeH;
      } else if (bit & (F_OHMS | F_VOLTS | F_AMPS)) {
        expect(58);
        complex();
        zr = cre;
        zi = cim;
      }
      if (seen & bit) throw NO;
      seen |= bit;
      ws();
      const c = s.charCodeAt(p++);
      if (c === 125) break;
      if (c !== 44) throw NO;
    }
    if (type < 0 || seen !== NEEDS[type]) throw NO;
    // what the general path rejects, or orders differently: its message, not ours
    if (id.length === 0) throw NO;
    if (aH === bH && aTo - aFrom === bTo - bFrom && s.startsWith(s.slice(aFrom, aTo), bFrom)) throw NO; // a node joined to itself
    if (idSet.has(id) || isSpecialKey(id)) throw NO;
    if (!(Math.abs(zr) <= MAX_MAGNITUDE && Math.abs(zi) <= MAX_MAGNITUDE)) throw NO;
    if (type === S_IMPEDANCE && !(Math.max(Math.abs(zr), Math.abs(zi)) >= MIN_IMPEDANCE)) throw NO;
    idSet.add(id);
    if (count === cap) grow();
    ids.push(id);
    kind[count] = type;
    n1[count] = node(aFrom, aTo, aH);
    n2[count] = node(bFrom, bTo, bH);
    vre[count] = zr;
    vim[count] = zi;
    count++;
  };

  // the top-level object
  expect(123);
  let top = 0;
  let sequence: 'ABC' | 'ACB' = 'ABC';
  for (;;) {
    ws();
    let bit: number;
    if (word('format')) {
      bit = 1;
      expect(58);
      ws();
      if (!word('wyeward-circuit')) throw NO;
    } else if (word('version')) {
      bit = 2;
      expect(58);
      if (readNumber() !== 1) throw NO;
    } else if (word('frequencyHz')) {
      bit = 4;
      expect(58);
      if (!(readNumber() > 0)) throw NO;
    } else if (word('elements')) {
      bit = 8;
      expect(58);
      expect(91);
      ws();
      if (s.charCodeAt(p) === 93) p++;
      else
        for (;;) {
          element();
          ws();
          const c = s.charCodeAt(p++);
          if (c === 93) break;
          if (c !== 44) throw NO;
        }
    } else if (word('name')) {
      bit = 16;
      expect(58);
      str();
    } else if (word('description')) {
      bit = 32;
      expect(58);
      str();
    } else if (word('sequence')) {
      bit = 64;
      expect(58);
      ws();
      if (word('ABC')) sequence = 'ABC';
      else if (word('ACB')) sequence = 'ACB';
      else throw NO;
    } else throw NO; // buses, limits, cases, anything else: the general path
    if (top & bit) throw NO;
    top |= bit;
    ws();
    const c = s.charCodeAt(p++);
    if (c === 125) break;
    if (c !== 44) throw NO;
  }
  ws();
  if (p !== len || (top & 15) !== 15) throw NO;
  const nodeIndex = new Map<string, number>();
  for (let i = 0; i < nodeNames.length; i++) nodeIndex.set(nodeNames[i], i);
  return { sequence, count, ids, kind: kind.subarray(0, count), n1: n1.subarray(0, count), n2: n2.subarray(0, count), re: vre.subarray(0, count), im: vim.subarray(0, count), nodeNames, nodeIndex };
}
