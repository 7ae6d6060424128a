/**
 * Why a bus's neutral sits where it does, from the circuit's topology alone (no voltages):
 * the neutral conductors of lines and multi-conductor switches join bus neutrals into groups;
 * a group is held when it contains a source neutral (a wye source's star point, a split-phase
 * source, a transformer winding whose star point is brought out on the bus). Then, per bus with
 * a neutral:
 * - 'open-neutral': its group is not held and a line or switch has its neutral opened at the
 *   group's edge (the neutral is broken upstream);
 * - 'floating-neutral': its group is not held and nothing was opened (a neutral never joined to
 *   any source neutral, e.g. a three-wire supply to four-wire loads);
 * - 'fault': held, and the study has a fault (the shift is the fault's return current);
 * - 'unbalance': held, no fault (the shift is unbalanced load current through the neutral path).
 * (P: the usual reading of a neutral-to-earth voltage; the wording follows the cause.)
 */
import type { Circuit } from '../schema/circuit.ts';
import type { NeutralCause } from './types.ts';

type Element = Circuit['elements'][number];

const nodeOfNeutral = (bus: string) => `${bus}.n`;

/** Neutral nodes held by a source neutral. */
function anchors(el: Element): string[] {
  switch (el.type) {
    case 'source':
      return el.connection === 'wye' ? [nodeOfNeutral(el.bus)] : [];
    case 'splitPhaseSource':
      return [nodeOfNeutral(el.bus)];
    case 'splitPhaseTransformer':
      return [nodeOfNeutral(el.to)];
    case 'transformer': {
      const out: string[] = [];
      const hvOut = el.vectorGroup ? el.vectorGroup.startsWith('YN') : el.connection!.split('-')[0] === 'Yg';
      const lvOut = el.vectorGroup ? /^(YN|Y|D)yn/.test(el.vectorGroup) : el.connection!.split('-')[1] === 'Yg';
      if (hvOut) out.push(nodeOfNeutral(el.from));
      if (lvOut) out.push(nodeOfNeutral(el.to));
      return out;
    }
    default:
      return [];
  }
}

/** Lines and switches carrying a neutral: joined (closed) or opened. */
function neutralLink(el: Element): { a: string; b: string; open: boolean } | null {
  if (el.type === 'line') {
    const has = el.impedance.kind === 'sequence' ? el.impedance.neutralOhmsPerLength !== undefined : lineHasNeutral(el);
    if (!has) return null;
    return { a: nodeOfNeutral(el.from), b: nodeOfNeutral(el.to), open: el.open.includes('n') };
  }
  if (el.type === 'switch3') {
    if (!el.conductors.includes('n')) return null;
    // A switch open on every conductor isolates the bus; only a neutral left open while the phases close is a broken neutral.
    if (!el.closed) return null;
    return { a: nodeOfNeutral(el.from), b: nodeOfNeutral(el.to), open: el.open.includes('n') };
  }
  if ((el.type === 'impedance' || el.type === 'switch') && el.from.endsWith('.n') && el.to.endsWith('.n')) {
    return { a: el.from, b: el.to, open: el.type === 'switch' && !el.closed };
  }
  return null;
}

function lineHasNeutral(el: Extract<Element, { type: 'line' }>): boolean {
  const imp = el.impedance;
  if (imp.kind === 'perConductor') return 'n' in imp.ohmsPerLength;
  if (imp.kind === 'matrix') return imp.conductors.includes('n');
  if (imp.kind === 'carson') return imp.conductors.some((c) => c.conductor === 'n' && !imp.kronReduceNeutral);
  return false;
}

/** Cause per bus neutral node ("BUS.n" → cause, with the opened elements for 'open-neutral'). */
export function neutralCauses(circuit: Circuit, busesWithNeutral: readonly string[]): Map<string, { cause: NeutralCause; openAt?: string[] }> {
  const parent = new Map<string, string>();
  const find = (x: string): string => {
    let r = x;
    while (parent.has(r) && parent.get(r) !== r) r = parent.get(r)!;
    parent.set(x, r);
    return r;
  };
  const union = (x: string, y: string) => {
    const rx = find(x);
    const ry = find(y);
    if (rx !== ry) parent.set(rx, ry);
  };
  const opened: { a: string; b: string; id: string }[] = [];
  const held = new Set<string>();
  let hasFault = false;
  for (const el of circuit.elements) {
    if (el.type === 'fault') hasFault = true;
    const link = neutralLink(el);
    if (link) {
      if (link.open) opened.push({ a: link.a, b: link.b, id: el.id });
      else union(link.a, link.b);
    }
  }
  // A network of primitives only says nothing of which node is a source neutral: no cause then.
  if (!circuit.elements.some((el) => el.type === 'source' || el.type === 'splitPhaseSource' || el.type === 'transformer' || el.type === 'splitPhaseTransformer')) return new Map();
  for (const el of circuit.elements) for (const n of anchors(el)) held.add(find(n));
  const out = new Map<string, { cause: NeutralCause; openAt?: string[] }>();
  for (const bus of busesWithNeutral) {
    const root = find(nodeOfNeutral(bus));
    if (held.has(root)) {
      out.set(bus, { cause: hasFault ? 'fault' : 'unbalance' });
      continue;
    }
    const openAt = [...new Set(opened.filter((o) => find(o.a) === root || find(o.b) === root).map((o) => o.id))];
    out.set(bus, openAt.length > 0 ? { cause: 'open-neutral', openAt } : { cause: 'floating-neutral' });
  }
  return out;
}
