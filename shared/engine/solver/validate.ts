/**
 * Validation of primitives at the solver level. The schema layer validates circuit files too,
 * but the solver must never crash on bad primitives: every problem becomes an InvalidCircuitError
 * naming the element and field.
 */
import { InvalidCircuitError } from '../errors.ts';
import type { Cx, Primitive } from '../types.ts';

type Issue = { path: string; message: string; id?: string };

const KINDS = new Set(['impedance', 'voltageSource', 'currentSource', 'coupledBranch', 'switch', 'admittanceMatrix', 'zipLoad']);

function isCx(v: unknown): v is Cx {
  return typeof v === 'object' && v !== null && typeof (v as Cx).re === 'number' && typeof (v as Cx).im === 'number';
}

/**
 * Magnitudes the solver accepts: finite, at most 1e100, and (for impedances) non-zero at least
 * 1e-100. Far beyond any physical network, and it keeps products and inverses clear of overflow
 * and underflow in double precision (a 1e-320 Ω impedance has no finite admittance).
 */
export const MAX_MAGNITUDE = 1e100;
export const MIN_IMPEDANCE = 1e-100;

function cxIssue(v: unknown, path: string, what: string): string | null {
  if (!isCx(v)) return `${what} must be a complex value { re, im }`;
  if (!Number.isFinite(v.re) || !Number.isFinite(v.im)) return `${what} must be finite (got ${v.re} + j${v.im})`;
  if (Math.abs(v.re) > MAX_MAGNITUDE || Math.abs(v.im) > MAX_MAGNITUDE) return `${what} is out of range (got ${v.re} + j${v.im}; at most 1e100 in magnitude)`;
  void path;
  return null;
}

function impedanceIssue(v: Cx, what: string): string | null {
  const m = Math.max(Math.abs(v.re), Math.abs(v.im));
  if (m === 0) return null; // reported separately where zero is not allowed
  if (m < MIN_IMPEDANCE) return `${what} is too small to invert (got ${v.re} + j${v.im}; use a closed switch for a direct connection)`;
  return null;
}

function nodeIssue(v: unknown, what: string): string | null {
  if (typeof v !== 'string' || v.length === 0) return `${what} must be a non-empty node name`;
  return null;
}

const finiteCx = (v: unknown): boolean =>
  isCx(v) && Number.isFinite(v.re) && Number.isFinite(v.im) && Math.abs(v.re) <= MAX_MAGNITUDE && Math.abs(v.im) <= MAX_MAGNITUDE;
const invertible = (z: Cx): boolean => Math.max(Math.abs(z.re), Math.abs(z.im)) >= MIN_IMPEDANCE;
const goodNode = (v: unknown): boolean => typeof v === 'string' && v.length > 0;
const goodPair = (a: unknown, b: unknown): boolean => goodNode(a) && goodNode(b) && a !== b;

function goodMatrix(z: unknown, n: number): boolean {
  if (!Array.isArray(z) || z.length !== n) return false;
  for (let i = 0; i < n; i++) {
    const row = z[i];
    if (!Array.isArray(row) || row.length !== n) return false;
    for (let j = 0; j < n; j++) if (!finiteCx(row[j])) return false;
  }
  return true;
}

function goodNodeList(nodes: unknown): nodes is string[] {
  if (!Array.isArray(nodes) || nodes.length === 0) return false;
  for (let i = 0; i < nodes.length; i++) {
    if (!goodNode(nodes[i])) return false;
    for (let j = 0; j < i; j++) if (nodes[j] === nodes[i]) return false;
  }
  return true;
}

/** Fast check of one element without building any message (the common, valid case). */
function quickValid(e: Record<string, unknown>): boolean {
  switch (e.type) {
    case 'impedance': {
      const z = e.ohms as Cx;
      return goodPair(e.from, e.to) && finiteCx(z) && invertible(z);
    }
    case 'voltageSource':
      return (
        goodPair(e.plus, e.minus) &&
        finiteCx(e.volts) &&
        (e.seriesOhms === undefined || (finiteCx(e.seriesOhms) && ((e.seriesOhms as Cx).re === 0 && (e.seriesOhms as Cx).im === 0 ? true : invertible(e.seriesOhms as Cx))))
      );
    case 'currentSource':
      return goodPair(e.from, e.to) && finiteCx(e.amps);
    case 'switch':
      return goodPair(e.from, e.to) && typeof e.closed === 'boolean';
    case 'coupledBranch': {
      const from = e.from;
      const to = e.to;
      if (!Array.isArray(from) || !Array.isArray(to) || from.length !== to.length) return false;
      return goodNodeList([...from, ...to]) && goodMatrix(e.ohms, from.length);
    }
    case 'admittanceMatrix':
      return goodNodeList(e.nodes) && goodMatrix(e.siemens, (e.nodes as string[]).length);
    case 'zipLoad': {
      const zip = e.zip as { z: number; i: number; p: number } | undefined;
      return (
        goodPair(e.from, e.to) &&
        typeof e.ratedVolts === 'number' &&
        Number.isFinite(e.ratedVolts) &&
        e.ratedVolts >= 1e-6 &&
        e.ratedVolts <= MAX_MAGNITUDE &&
        finiteCx(e.ratedVA) &&
        typeof zip === 'object' &&
        zip !== null &&
        Number.isFinite(zip.z) &&
        Number.isFinite(zip.i) &&
        Number.isFinite(zip.p) &&
        Math.abs(zip.z + zip.i + zip.p - 1) <= 1e-6
      );
    }
    default:
      return false;
  }
}

/** Check every primitive; throws InvalidCircuitError listing the problems (first one in the message). */
export function validatePrimitives(prims: readonly Primitive[]): void {
  if (!Array.isArray(prims)) throw new InvalidCircuitError('Primitives must be an array', [{ path: '', message: 'not an array' }]);
  // fast path: every element valid and every id unique, no strings built
  const ids = new Set<string>();
  let firstBad = -1;
  for (let k = 0; k < prims.length && firstBad < 0; k++) {
    const e = prims[k] as unknown as Record<string, unknown>;
    if (typeof e !== 'object' || e === null || typeof e.id !== 'string' || e.id.length === 0 || ids.has(e.id) || !quickValid(e)) firstBad = k;
    else ids.add(e.id);
  }
  if (firstBad < 0) return;
  const issues: Issue[] = [];
  const seen = new Set<string>();
  for (let k = 0; k < prims.length; k++) {
    const e = prims[k] as unknown as Record<string, unknown>;
    const at = `elements[${k}]`;
    if (typeof e !== 'object' || e === null) {
      issues.push({ path: at, message: `element ${k} is not an object` });
      continue;
    }
    const id = e.id;
    if (typeof id !== 'string' || id.length === 0) {
      issues.push({ path: `${at}.id`, message: `element ${k} has no id (a non-empty string)` });
      continue;
    }
    const name = `element '${id}'`;
    if (seen.has(id)) issues.push({ path: `${at}.id`, message: `duplicate element id '${id}'`, id });
    seen.add(id);
    if (typeof e.type !== 'string' || !KINDS.has(e.type)) {
      issues.push({ path: `${at}.type`, message: `${name} has unknown type '${String(e.type)}'`, id });
      continue;
    }
    const push = (field: string, msg: string | null) => {
      if (msg) issues.push({ path: `${at}.${field}`, message: msg, id });
    };
    const twoTerminal = (a: string, b: string) => {
      push(a, nodeIssue(e[a], `${name}: '${a}'`));
      push(b, nodeIssue(e[b], `${name}: '${b}'`));
      if (typeof e[a] === 'string' && e[a] === e[b]) push(b, `${name} connects node '${String(e[a])}' to itself`);
    };
    switch (e.type) {
      case 'impedance': {
        twoTerminal('from', 'to');
        const m = cxIssue(e.ohms, 'ohms', `${name}: impedance 'ohms'`);
        push('ohms', m);
        if (!m && (e.ohms as Cx).re === 0 && (e.ohms as Cx).im === 0)
          push('ohms', `${name} has zero impedance (use a closed switch for a direct connection)`);
        else if (!m) push('ohms', impedanceIssue(e.ohms as Cx, `${name}: impedance 'ohms'`));
        break;
      }
      case 'voltageSource': {
        twoTerminal('plus', 'minus');
        push('volts', cxIssue(e.volts, 'volts', `${name}: 'volts'`));
        if (e.seriesOhms !== undefined) {
          const m = cxIssue(e.seriesOhms, 'seriesOhms', `${name}: 'seriesOhms'`);
          push('seriesOhms', m ?? impedanceIssue(e.seriesOhms as Cx, `${name}: 'seriesOhms'`));
        }
        break;
      }
      case 'currentSource': {
        twoTerminal('from', 'to');
        push('amps', cxIssue(e.amps, 'amps', `${name}: 'amps'`));
        break;
      }
      case 'switch': {
        twoTerminal('from', 'to');
        if (typeof e.closed !== 'boolean') push('closed', `${name}: 'closed' must be true or false`);
        break;
      }
      case 'coupledBranch': {
        const from = e.from;
        const to = e.to;
        const z = e.ohms;
        if (!Array.isArray(from) || !Array.isArray(to) || from.length === 0 || from.length !== to.length) {
          push('from', `${name}: 'from' and 'to' must be node lists of the same non-zero length`);
          break;
        }
        for (let c = 0; c < from.length; c++) {
          push(`from[${c}]`, nodeIssue(from[c], `${name}: from[${c}]`));
          push(`to[${c}]`, nodeIssue(to[c], `${name}: to[${c}]`));
          if (typeof from[c] === 'string' && from[c] === to[c]) push(`to[${c}]`, `${name}: conductor ${c} connects node '${from[c]}' to itself`);
        }
        const all = [...from, ...to];
        if (new Set(all).size !== all.length) push('from', `${name}: a node appears twice among its conductor ends`);
        const n = from.length;
        if (!Array.isArray(z) || z.length !== n || z.some((row) => !Array.isArray(row) || row.length !== n)) {
          push('ohms', `${name}: 'ohms' must be a ${n}×${n} matrix`);
          break;
        }
        for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) push(`ohms[${i}][${j}]`, cxIssue(z[i][j], '', `${name}: ohms[${i}][${j}]`));
        break;
      }
      case 'admittanceMatrix': {
        const nodes = e.nodes;
        const y = e.siemens;
        if (!Array.isArray(nodes) || nodes.length === 0) {
          push('nodes', `${name}: 'nodes' must be a non-empty node list`);
          break;
        }
        for (let c = 0; c < nodes.length; c++) push(`nodes[${c}]`, nodeIssue(nodes[c], `${name}: nodes[${c}]`));
        if (new Set(nodes).size !== nodes.length) push('nodes', `${name}: a node appears twice in 'nodes'`);
        const n = nodes.length;
        if (!Array.isArray(y) || y.length !== n || y.some((row) => !Array.isArray(row) || row.length !== n)) {
          push('siemens', `${name}: 'siemens' must be a ${n}×${n} matrix`);
          break;
        }
        for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) push(`siemens[${i}][${j}]`, cxIssue(y[i][j], '', `${name}: siemens[${i}][${j}]`));
        break;
      }
      case 'zipLoad': {
        twoTerminal('from', 'to');
        if (typeof e.ratedVolts !== 'number' || !Number.isFinite(e.ratedVolts) || e.ratedVolts <= 0)
          push('ratedVolts', `${name}: 'ratedVolts' must be a positive finite number of volts`);
        else if (e.ratedVolts < 1e-6 || e.ratedVolts > MAX_MAGNITUDE) push('ratedVolts', `${name}: 'ratedVolts' is out of range (got ${e.ratedVolts} V)`);
        push('ratedVA', cxIssue(e.ratedVA, 'ratedVA', `${name}: 'ratedVA'`));
        const zip = e.zip as { z: unknown; i: unknown; p: unknown } | undefined;
        if (typeof zip !== 'object' || zip === null || ![zip.z, zip.i, zip.p].every((v) => typeof v === 'number' && Number.isFinite(v))) {
          push('zip', `${name}: 'zip' must hold finite fractions z, i, p`);
        } else {
          const s = (zip.z as number) + (zip.i as number) + (zip.p as number);
          if (Math.abs(s - 1) > 1e-6) push('zip', `${name}: zip fractions must sum to 1 (got ${+s.toPrecision(6)})`);
        }
        break;
      }
    }
  }
  if (issues.length === 0) {
    // the fast check and the detailed one disagree: still refuse, naming the element
    const e = prims[firstBad] as unknown as { id?: unknown };
    issues.push({ path: `elements[${firstBad}]`, message: `element '${String(e?.id)}' is not a valid primitive`, id: typeof e?.id === 'string' ? e.id : undefined });
  }
  if (issues.length > 0) {
    const more = issues.length > 1 ? ` (and ${issues.length - 1} more problem${issues.length > 2 ? 's' : ''})` : '';
    const ids = [...new Set(issues.map((i) => i.id).filter((x): x is string => !!x))];
    throw new InvalidCircuitError(
      `Invalid circuit: ${issues[0].message}${more}`,
      issues.map(({ path, message }) => ({ path, message })),
      { elementIds: ids },
    );
  }
}
