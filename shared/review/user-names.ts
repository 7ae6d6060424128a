/**
 * What users read speaks only of what they drew. The workspace turns a connection with an opened
 * conductor into a hidden switch `<element>~<field>~sw` from the bus the user drew to a private
 * terminal bus `<element>~<field>` of the element (one-click opening of a neutral). Those names,
 * and the engine's type names (`switch3`, `capacitorBank`, `zipLoad`…), never reach a page, an
 * e-mail or an error message: this module maps them back to the elements, buses and conductors
 * of the diagram, in words ("neutral of the connection KITCHEN–HOUSE opened").
 *
 * Everything here is derived from a stored circuit at the moment it is shown; nothing is stored.
 * Pure TypeScript (no Node or DOM APIs): used by the server (diff, mail, audit, import errors)
 * and the browser (revision view, details, comments) alike.
 */

/** Marker of generated names: bus names and ids the user types never contain it. */
export const PRIVATE_MARK = '~';

/** True for a generated (internal) name. */
export function isPrivateName(name: string): boolean {
  return name.includes(PRIVATE_MARK);
}

/** An opened connection: the hidden switch behind it and where it sits on the diagram. */
export interface Opening {
  /** Id of the hidden switch (`KITCHEN~bus~sw`). */
  switchId: string;
  /** The element the user drew (`KITCHEN`). */
  element: string;
  /** The element field the connection is (`bus`, `from`, `to`, `node`). */
  field: string;
  /** The bus the user drew (`HOUSE`). */
  bus: string;
  /** The element's private terminal bus (`KITCHEN~bus`). */
  privateBus: string;
  /** Conductors of the connection and those opened, in a/b/c/n/1/2 order. */
  conductors: string[];
  open: string[];
}

const CONDUCTOR_ORDER = ['a', 'b', 'c', 'n', '1', '2'];

/** A conductor as the diagram names it: A, B, C, N, leg 1, leg 2. */
export function conductorName(c: string): string {
  if (c === '1' || c === '2') return `leg ${c}`;
  return /^[abcn]$/.test(c) ? c.toUpperCase() : c;
}

/** Conductors in words: "neutral", "phase A", "phases A and B and the neutral". */
export function conductorWords(cs: readonly string[]): string {
  const sorted = [...cs].sort((x, y) => CONDUCTOR_ORDER.indexOf(x) - CONDUCTOR_ORDER.indexOf(y));
  const phases = sorted.filter((c) => c !== 'n');
  const parts: string[] = [];
  if (phases.length > 0) {
    const named = phases.map((c) => (c === '1' || c === '2' ? c : c.toUpperCase()));
    const legs = phases.every((c) => c === '1' || c === '2');
    parts.push(`${legs ? (phases.length > 1 ? 'legs' : 'leg') : phases.length > 1 ? 'phases' : 'phase'} ${joinWords(named)}`);
  }
  if (sorted.includes('n')) parts.push(parts.length > 0 ? 'the neutral' : 'neutral');
  return parts.length === 0 ? 'no conductor' : parts.join(' and ');
}

/** "A", "A and B", "A, B and C". */
export function joinWords(items: readonly string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

/** The engine's element type names in the words of the palette. */
const TYPE_WORDS: Record<string, string> = {
  source: 'source',
  splitPhaseSource: 'split-phase source',
  line: 'line',
  transformer: 'transformer bank',
  splitPhaseTransformer: 'single-phase transformer',
  load: 'load',
  capacitorBank: 'capacitor bank',
  fault: 'fault',
  switch3: 'switch',
  earthing: 'earth electrode',
  impedance: 'impedance branch',
  voltageSource: 'voltage source',
  currentSource: 'current source',
  coupledBranch: 'coupled branch',
  switch: 'single-pole switch',
  admittanceMatrix: 'admittance block',
  zipLoad: 'ZIP load',
};

/** An element type in words ("transformer bank", "switch"); an unknown type reads "element". */
export function typeWord(type: unknown): string {
  return typeof type === 'string' && Object.hasOwn(TYPE_WORDS, type) ? TYPE_WORDS[type] : 'element';
}

/** Type names that are never ordinary words, replaced wherever they appear in a message. */
const CAMEL_TYPES = Object.keys(TYPE_WORDS).filter((t) => /[A-Z0-9]/.test(t));
const CAMEL_TYPE_RE = new RegExp(`\\b(${CAMEL_TYPES.join('|')})\\b`, 'g');

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function elementsOf(circuit: unknown): Record<string, unknown>[] {
  return isRecord(circuit) && Array.isArray(circuit.elements) ? circuit.elements.filter(isRecord) : [];
}

/** The opened connections of a stored circuit (the hidden switches the workspace wrote). */
export function openingsOf(circuit: unknown): Opening[] {
  const els = elementsOf(circuit);
  const ids = new Set(els.map((e) => e.id).filter((x): x is string => typeof x === 'string'));
  const out: Opening[] = [];
  for (const e of els) {
    if (e.type !== 'switch3' || typeof e.id !== 'string' || !isPrivateName(e.id)) continue;
    const parts = e.id.split(PRIVATE_MARK);
    if (parts.length !== 3 || parts[2] !== 'sw' || typeof e.from !== 'string' || typeof e.to !== 'string') continue;
    const [element, field] = parts;
    if (!ids.has(element)) continue;
    const conductors = (Array.isArray(e.conductors) ? e.conductors : ['a', 'b', 'c', 'n']).filter((c): c is string => typeof c === 'string');
    const open = e.closed === false ? conductors : (Array.isArray(e.open) ? e.open : []).filter((c): c is string => typeof c === 'string');
    out.push({ switchId: e.id, element, field, bus: e.from, privateBus: e.to, conductors, open: [...open].sort((x, y) => CONDUCTOR_ORDER.indexOf(x) - CONDUCTOR_ORDER.indexOf(y)) });
  }
  return out;
}

/** "the connection KITCHEN–HOUSE" without the article. */
function connectionName(o: { element: string; bus: string }): string {
  return `connection ${o.element}–${o.bus}`;
}

/** "neutral of the connection KITCHEN–HOUSE opened". */
export function openingSentence(o: Pick<Opening, 'element' | 'bus' | 'open'>): string {
  return o.open.length === 0 ? `the connection ${o.element}–${o.bus} is closed` : `${conductorWords(o.open)} of the connection ${o.element}–${o.bus} opened`;
}

/** Names of one stored circuit as users read them. */
export interface CircuitNames {
  readonly openings: readonly Opening[];
  /** True for an element users never drew (a hidden switch). */
  isHidden(id: string): boolean;
  /** The bus the user drew: itself, or the bus behind a private terminal bus. */
  drawnBus(bus: string): string;
  /** A bus in words: its name, or "KITCHEN terminals at HOUSE" for a private terminal bus. */
  bus(bus: string): string;
  /** The element the user drew: itself, or the element a hidden switch belongs to. */
  drawnElement(id: string): string;
  /** An element in words: its id, or "connection KITCHEN–HOUSE" for a hidden switch. */
  element(id: string): string;
  /** A message (engine error, flag) with every internal name and type name put into words. */
  text(message: string): string;
}

/** Splits `rest` of a token after a known prefix into a conductor (`.n`, `/a`) and trailing punctuation. */
function tail(rest: string, sep: '.' | '/'): { conductor: string | null; trailing: string } | null {
  const m = new RegExp(`^(?:\\${sep}([abcn12]))?([.,;:!?)\\]]*)$`).exec(rest);
  return m ? { conductor: m[1] ?? null, trailing: m[2] } : null;
}

/** The names of a stored circuit (read defensively: it is JSON). */
export function circuitNames(circuit: unknown): CircuitNames {
  const openings = openingsOf(circuit);
  const bySwitch = new Map(openings.map((o) => [o.switchId, o] as const));
  const byBus = new Map(openings.map((o) => [o.privateBus, o] as const));
  const ids = new Set(elementsOf(circuit).map((e) => e.id).filter((x): x is string => typeof x === 'string' && !isPrivateName(x)));

  /** A generated name without a table entry (damaged or foreign circuit): read its parts. */
  const guess = (name: string): { element: string; bus: string } => {
    const [element] = name.split(PRIVATE_MARK);
    return { element: element || 'an element', bus: 'its bus' };
  };

  const drawnBus = (bus: string) => byBus.get(bus)?.bus ?? (isPrivateName(bus) ? guess(bus).bus : bus);
  const busWords = (bus: string) => {
    if (!isPrivateName(bus)) return bus;
    const o = byBus.get(bus) ?? guess(bus);
    return `${o.element} terminals at ${o.bus}`;
  };
  const drawnElement = (id: string) => bySwitch.get(id)?.element ?? (isPrivateName(id) ? guess(id).element : id);
  const elementWords = (id: string) => (isPrivateName(id) ? connectionName(bySwitch.get(id) ?? guess(id)) : id);

  /** One whitespace-delimited token containing the marker, in words. */
  const token = (tok: string): string => {
    const lead = /^[("'“[]*/.exec(tok)![0];
    const body = tok.slice(lead.length);
    for (const o of openings) {
      if (body.startsWith(o.switchId)) {
        const t = tail(body.slice(o.switchId.length), '/');
        if (t) return `${lead}${t.conductor ? `conductor ${conductorName(t.conductor)} of the ` : ''}${connectionName(o)}${t.trailing}`;
      }
    }
    for (const o of openings) {
      if (body.startsWith(o.privateBus)) {
        const t = tail(body.slice(o.privateBus.length), '.');
        if (t) return `${lead}${o.element} ${t.conductor ? `terminal ${conductorName(t.conductor)}` : 'terminals'} at ${o.bus}${t.trailing}`;
      }
    }
    // A generated name with no switch in this circuit (a damaged or foreign file): read its parts.
    const m = /^([^~]*)~([^~]*?)(~sw)?(?:[./]([abcn12]))?([.,;:!?)\]]*)$/.exec(body);
    if (m) {
      const element = m[1] || 'an element';
      if (m[3]) return `${lead}${m[4] ? `conductor ${conductorName(m[4])} of the ` : ''}connection ${element}–its bus${m[5]}`;
      return `${lead}${element} ${m[4] ? `terminal ${conductorName(m[4])}` : 'terminals'}${m[5]}`;
    }
    return `${lead}${guess(body).element}`;
  };

  const text = (message: string): string => {
    let s = message
      // "bus KITCHEN~bus a-n:" → "KITCHEN terminals at HOUSE a-n:" (it is not a bus the user drew).
      .replace(/\b(?:bus|switch3|switch) (\S*~\S*)/g, (_m, name: string) => token(name))
      .replace(/\S*~\S*/g, (tok) => token(tok))
      .replace(CAMEL_TYPE_RE, (t) => TYPE_WORDS[t]);
    // Primitive names of an element's expansion ("LOAD1/a") read as the element and its phase.
    s = s.replace(/([^\s"'(),;:]+)\/([a-z0-9]+)\b/g, (m, id: string, part: string) => (ids.has(id) ? `${id} (${/^[abcn12]$/.test(part) ? conductorName(part) : part})` : m));
    return s;
  };

  return {
    openings,
    isHidden: (id) => isPrivateName(id),
    drawnBus,
    bus: busWords,
    drawnElement,
    element: elementWords,
    text,
  };
}

/**
 * The elements as the user drew them: hidden switches left out, each element's private terminal
 * bus replaced by the bus it was drawn on, and the opened conductors of each connection kept as
 * `opened: { <field>: [conductors] }` (absent when nothing is opened).
 */
export function drawnElements(circuit: unknown): Map<string, Record<string, unknown>> {
  const openings = openingsOf(circuit);
  const byBus = new Map(openings.map((o) => [o.privateBus, o] as const));
  const out = new Map<string, Record<string, unknown>>();
  elementsOf(circuit).forEach((e, i) => {
    const id = typeof e.id === 'string' ? e.id : `element ${i + 1}`;
    if (isPrivateName(id)) return;
    const copy: Record<string, unknown> = { ...e };
    const opened: Record<string, string[]> = {};
    for (const [k, v] of Object.entries(e)) {
      if (typeof v !== 'string' || !isPrivateName(v)) continue;
      const dot = k === 'node' ? v.lastIndexOf('.') : -1;
      const bus = dot > 0 ? v.slice(0, dot) : v;
      const o = byBus.get(bus);
      if (!o) continue;
      copy[k] = dot > 0 ? `${o.bus}${v.slice(dot)}` : o.bus;
      if (o.open.length > 0) opened[k] = o.open;
    }
    if (Object.keys(opened).length > 0) copy.opened = opened;
    out.set(id, copy);
  });
  return out;
}

/** "3 loads", "1 switch", "2 switches": a count with its type word. */
export function countWords(count: number, word: string): string {
  if (count === 1) return `1 ${word}`;
  return `${count} ${/(s|x|ch|sh)$/.test(word) ? `${word}es` : `${word}s`}`;
}

/** Element counts by type in words, as drawn (hidden switches not counted). */
export function drawnCounts(circuit: unknown): { total: number; byType: { type: string; count: number }[] } {
  const counts = new Map<string, number>();
  let total = 0;
  for (const e of drawnElements(circuit).values()) {
    const w = typeWord(e.type);
    counts.set(w, (counts.get(w) ?? 0) + 1);
    total++;
  }
  return { total, byType: [...counts].map(([type, count]) => ({ type, count })).sort((a, b) => b.count - a.count || a.type.localeCompare(b.type)) };
}

/** Where a comment points (an element, or a result row of the results summary), in words. */
export function anchorWords(anchor: { elementId: string } | { resultRow: { table: string; key: string } }, names: CircuitNames = circuitNames(null)): string {
  if ('elementId' in anchor) {
    const id = anchor.elementId;
    return names.isHidden(id) ? names.element(id) : `element ${id}`;
  }
  const { table, key } = anchor.resultRow;
  if (table === 'bus-voltages') return `bus voltages at ${names.bus(key)}`;
  if (table === 'neutral-currents') {
    const at = key.lastIndexOf('@');
    const el = at > 0 ? key.slice(0, at) : key;
    const bus = at > 0 ? key.slice(at + 1) : '';
    return `neutral current of ${names.drawnElement(el)}${bus ? ` at ${names.drawnBus(bus)}` : ''}`;
  }
  return `result ${names.text(key)}`;
}
