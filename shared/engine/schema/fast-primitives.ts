/**
 * A fast path for validating primitive elements: a hand-written check of exactly the shapes in
 * primitives.ts that returns the same value zod's parse returns (a fresh copy, keys in schema
 * order), or `undefined` when the element is not certainly valid — the caller then runs the zod
 * schema, which gives the full, plainly worded issues. Why: on a 5 000-bus feeder (~20 000
 * primitives) zod took ~130 ms of a ~1.5 s CLI run; this check takes a few ms. It never accepts
 * what the schema rejects (tests compare both on valid and invalid elements).
 */
import type { Cx } from '../types.ts';
import type { ComplexInput } from './common.ts';

type Obj = Record<string, unknown>;

const isObj = (v: unknown): v is Obj => v !== null && typeof v === 'object' && !Array.isArray(v);
const isNum = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);
const isStr = (v: unknown): v is string => typeof v === 'string' && v.length > 0;

/** Own enumerable keys of `o` are all in `allowed` (zod's strictObject rejects any other key). */
function onlyKeys(o: Obj, allowed: readonly string[]): boolean {
  for (const k in o) if (!Object.prototype.hasOwnProperty.call(o, k) || !allowed.includes(k)) return false;
  return true;
}

/** A complex input (number, {re, im} or {mag ≥ 0, angleDeg}) copied, or undefined. */
function complex(v: unknown): ComplexInput | undefined {
  if (typeof v === 'number') return Number.isFinite(v) ? v : undefined;
  if (!isObj(v)) return undefined;
  let keys = 0;
  for (const k in v) {
    if (!Object.prototype.hasOwnProperty.call(v, k)) return undefined;
    keys++;
  }
  if (keys !== 2) return undefined;
  if (isNum(v.re) && isNum(v.im)) return { re: v.re, im: v.im } as Cx;
  if (isNum(v.mag) && v.mag >= 0 && isNum(v.angleDeg)) return { mag: v.mag, angleDeg: v.angleDeg };
  return undefined;
}

/** A non-empty array of non-empty strings, copied, or undefined. */
function nodeList(v: unknown): string[] | undefined {
  if (!Array.isArray(v) || v.length === 0) return undefined;
  const out = new Array<string>(v.length);
  for (let i = 0; i < v.length; i++) {
    const s = v[i];
    if (!isStr(s)) return undefined;
    out[i] = s;
  }
  return out;
}

/** An array of arrays of complex inputs (any sizes; sizes are checked later), copied, or undefined. */
function complexMatrix(v: unknown): ComplexInput[][] | undefined {
  if (!Array.isArray(v)) return undefined;
  const out = new Array<ComplexInput[]>(v.length);
  for (let i = 0; i < v.length; i++) {
    const row = v[i];
    if (!Array.isArray(row)) return undefined;
    const r = new Array<ComplexInput>(row.length);
    for (let j = 0; j < row.length; j++) {
      const z = complex(row[j]);
      if (z === undefined) return undefined;
      r[j] = z;
    }
    out[i] = r;
  }
  return out;
}

const K = {
  impedance: ['type', 'id', 'from', 'to', 'ohms'],
  voltageSource: ['type', 'id', 'plus', 'minus', 'volts', 'seriesOhms'],
  currentSource: ['type', 'id', 'from', 'to', 'amps'],
  coupledBranch: ['type', 'id', 'from', 'to', 'ohms'],
  switch: ['type', 'id', 'from', 'to', 'closed'],
  admittanceMatrix: ['type', 'id', 'nodes', 'siemens'],
  zipLoad: ['type', 'id', 'from', 'to', 'ratedVolts', 'ratedVA', 'zip'],
} as const;
const ZIP_KEYS = ['z', 'i', 'p'] as const;

/** The parsed primitive (as zod's parse would return it) when `el` is certainly valid, else undefined. */
export function fastParsePrimitive(el: Obj): Obj | undefined {
  const type = el.type;
  const id = el.id;
  if (!isStr(id)) return undefined;
  switch (type) {
    case 'impedance':
    case 'currentSource': {
      if (!onlyKeys(el, K[type]) || !isStr(el.from) || !isStr(el.to)) return undefined;
      const key = type === 'impedance' ? 'ohms' : 'amps';
      const z = complex(el[key]);
      if (z === undefined) return undefined;
      return type === 'impedance' ? { type, id, from: el.from, to: el.to, ohms: z } : { type, id, from: el.from, to: el.to, amps: z };
    }
    case 'voltageSource': {
      if (!onlyKeys(el, K.voltageSource) || !isStr(el.plus) || !isStr(el.minus)) return undefined;
      const volts = complex(el.volts);
      if (volts === undefined) return undefined;
      if (!('seriesOhms' in el)) return { type, id, plus: el.plus, minus: el.minus, volts };
      const seriesOhms = el.seriesOhms === undefined ? undefined : complex(el.seriesOhms);
      if (seriesOhms === undefined) return undefined; // an explicit undefined: let zod decide
      return { type, id, plus: el.plus, minus: el.minus, volts, seriesOhms };
    }
    case 'coupledBranch': {
      if (!onlyKeys(el, K.coupledBranch)) return undefined;
      const from = nodeList(el.from);
      const to = nodeList(el.to);
      const ohms = complexMatrix(el.ohms);
      if (!from || !to || !ohms) return undefined;
      return { type, id, from, to, ohms };
    }
    case 'switch':
      if (!onlyKeys(el, K.switch) || !isStr(el.from) || !isStr(el.to) || typeof el.closed !== 'boolean') return undefined;
      return { type, id, from: el.from, to: el.to, closed: el.closed };
    case 'admittanceMatrix': {
      if (!onlyKeys(el, K.admittanceMatrix)) return undefined;
      const nodes = nodeList(el.nodes);
      const siemens = complexMatrix(el.siemens);
      if (!nodes || !siemens) return undefined;
      return { type, id, nodes, siemens };
    }
    case 'zipLoad': {
      if (!onlyKeys(el, K.zipLoad) || !isStr(el.from) || !isStr(el.to) || !isNum(el.ratedVolts) || !(el.ratedVolts > 0)) return undefined;
      const ratedVA = complex(el.ratedVA);
      if (ratedVA === undefined) return undefined;
      const base = { type, id, from: el.from, to: el.to, ratedVolts: el.ratedVolts, ratedVA };
      if (!('zip' in el)) return base;
      const zip = el.zip;
      if (!isObj(zip) || !onlyKeys(zip, ZIP_KEYS)) return undefined;
      const { z, i, p } = zip;
      if (!isNum(z) || !isNum(i) || !isNum(p) || z < 0 || i < 0 || p < 0) return undefined;
      return { ...base, zip: { z, i, p } };
    }
    default:
      return undefined;
  }
}
