/**
 * The circuit as a one-line diagram in SVG (vector), for the report and the print view: each bus a
 * bar, each element a plain symbol (circle for a source, two circles for a transformer, a
 * segment for a line or switch, an arrow for a load, plates for a capacitor bank, a zigzag for a
 * fault, the earth sign for an electrode) wired to its buses, labelled with the names the user
 * drew and any opened conductor. Positions come from the study's canvas layout
 * (`layout.positions`: `bus:<name>` and element ids) when it has them; buses and elements without
 * a stored position are placed in tiers from the sources down (a line's far bus one tier lower).
 * Pure TypeScript: returns SVG text.
 */
import { conductorWords, drawnElements } from '../review/user-names.ts';

type XY = { x: number; y: number };

interface DrawnElement {
  id: string;
  type: string;
  buses: string[];
  opened: string[];
}

const TIER = 190;
const SLOT = 110;

function escapeXml(s: string): string {
  return s.replace(/[<>&"']/g, (c) => ({ '<': '&lt;', '>': '&gt;', '&': '&amp;', '"': '&quot;', "'": '&apos;' })[c]!);
}

function busOf(v: unknown): string | null {
  return typeof v === 'string' && v.length > 0 ? v.split('.')[0] : null;
}

function elementsOf(circuit: unknown): DrawnElement[] {
  const out: DrawnElement[] = [];
  for (const [id, e] of drawnElements(circuit)) {
    const buses = ['bus', 'from', 'to', 'node'].map((k) => busOf(e[k])).filter((b): b is string => b !== null);
    const opened = new Set<string>(Array.isArray(e.open) ? (e.open as string[]) : []);
    const byField = e.opened && typeof e.opened === 'object' ? (e.opened as Record<string, string[]>) : {};
    for (const cs of Object.values(byField)) for (const c of cs) opened.add(c);
    out.push({ id, type: String(e.type), buses: [...new Set(buses)], opened: [...opened] });
  }
  return out;
}

const SERIES = new Set(['line', 'transformer', 'splitPhaseTransformer', 'switch3']);
const ABOVE = new Set(['source', 'splitPhaseSource', 'voltageSource']);

/** Positions of buses and elements: stored ones first, the rest in tiers from the sources. */
function place(elements: DrawnElement[], stored: Record<string, XY>): { buses: Map<string, XY>; elements: Map<string, XY> } {
  const busNames = [...new Set(elements.flatMap((e) => e.buses))];
  const tier = new Map<string, number>();
  const queue = busNames.filter((b) => elements.some((e) => ABOVE.has(e.type) && e.buses[0] === b));
  for (const b of queue) tier.set(b, 0);
  while (queue.length) {
    const b = queue.shift()!;
    for (const e of elements) {
      if (!SERIES.has(e.type) || e.buses.length < 2) continue;
      const i = e.buses.indexOf(b);
      if (i < 0) continue;
      for (const other of e.buses) {
        if (!tier.has(other)) {
          tier.set(other, tier.get(b)! + 1);
          queue.push(other);
        }
      }
    }
  }
  for (const b of busNames) if (!tier.has(b)) tier.set(b, 0);

  const buses = new Map<string, XY>();
  const els = new Map<string, XY>();
  const cursor = new Map<number, number>();
  for (const b of busNames) {
    const below = elements.filter((e) => e.buses[0] === b && !ABOVE.has(e.type));
    const above = elements.filter((e) => e.buses[0] === b && ABOVE.has(e.type));
    const width = Math.max(1, below.length, above.length) * SLOT;
    const t = tier.get(b)!;
    const x0 = cursor.get(t) ?? 0;
    cursor.set(t, x0 + width + SLOT / 2);
    const y = t * TIER;
    buses.set(b, stored[`bus:${b}`] ?? { x: x0 + width / 2, y });
    below.forEach((e, k) => {
      if (stored[e.id]) return;
      els.set(e.id, SERIES.has(e.type) && e.buses.length > 1 ? { x: x0 + SLOT / 2 + k * SLOT, y: y + TIER / 2 } : { x: x0 + SLOT / 2 + k * SLOT, y: y + 75 });
    });
    // one source above its bus sits over its middle; several side by side, never on top of each other
    if (above.length > 1) {
      above.forEach((e, k) => {
        const at = buses.get(b)!;
        if (!stored[e.id]) els.set(e.id, { x: at.x + (k - (above.length - 1) / 2) * SLOT, y: at.y - 75 });
      });
    }
  }
  for (const e of elements) {
    if (stored[e.id]) els.set(e.id, stored[e.id]);
    else if (!els.has(e.id)) {
      const b = buses.get(e.buses[0]) ?? { x: 0, y: 0 };
      els.set(e.id, ABOVE.has(e.type) ? { x: b.x, y: b.y - 75 } : { x: b.x, y: b.y + 75 });
    }
  }
  return { buses, elements: els };
}

function symbol(type: string, p: XY): string {
  const { x, y } = p;
  switch (type) {
    case 'source':
    case 'splitPhaseSource':
    case 'voltageSource':
      return `<circle cx="${x}" cy="${y}" r="14" fill="white" stroke="black" stroke-width="1.2"/><path d="M${x - 8} ${y} q4 -7 8 0 t8 0" fill="none" stroke="black" stroke-width="1.2"/>`;
    case 'transformer':
    case 'splitPhaseTransformer':
      return `<circle cx="${x}" cy="${y - 7}" r="10" fill="none" stroke="black" stroke-width="1.2"/><circle cx="${x}" cy="${y + 7}" r="10" fill="none" stroke="black" stroke-width="1.2"/>`;
    case 'load':
      return `<path d="M${x - 7} ${y - 4} L${x + 7} ${y - 4} L${x} ${y + 8} Z" fill="black"/>`;
    case 'capacitorBank':
      return `<line x1="${x - 9}" y1="${y - 3}" x2="${x + 9}" y2="${y - 3}" stroke="black" stroke-width="2"/><line x1="${x - 9}" y1="${y + 3}" x2="${x + 9}" y2="${y + 3}" stroke="black" stroke-width="2"/>`;
    case 'fault':
      return `<path d="M${x - 5} ${y - 10} L${x + 4} ${y - 1} L${x - 4} ${y + 1} L${x + 5} ${y + 10}" fill="none" stroke="black" stroke-width="1.5"/>`;
    case 'earthing':
      return `<line x1="${x - 10}" y1="${y}" x2="${x + 10}" y2="${y}" stroke="black" stroke-width="1.2"/><line x1="${x - 6}" y1="${y + 4}" x2="${x + 6}" y2="${y + 4}" stroke="black" stroke-width="1.2"/><line x1="${x - 2}" y1="${y + 8}" x2="${x + 2}" y2="${y + 8}" stroke="black" stroke-width="1.2"/>`;
    case 'switch3':
      return `<circle cx="${x}" cy="${y - 8}" r="2" fill="black"/><line x1="${x}" y1="${y - 8}" x2="${x + 7}" y2="${y + 8}" stroke="black" stroke-width="1.2"/><circle cx="${x}" cy="${y + 8}" r="2" fill="black"/>`;
    default:
      return `<rect x="${x - 9}" y="${y - 6}" width="18" height="12" fill="white" stroke="black" stroke-width="1.2"/>`;
  }
}

/** A label of the diagram: text at a baseline point in SVG units. */
export interface DiagramLabel {
  x: number;
  y: number;
  text: string;
  size: number;
  bold?: boolean;
  colour?: string;
}

/**
 * The one-line diagram of a stored circuit and layout as SVG text, with its size and origin in SVG
 * units. Without `labels` the SVG has no text and the labels come back separately (the PDF sets
 * them as its own text: SVG text is slow to embed).
 */
export function oneLineSvg(circuit: unknown, layout: unknown, fontFamily: string, { labels: inSvg = true }: { labels?: boolean } = {}): { svg: string; width: number; height: number; minX: number; minY: number; labels: DiagramLabel[] } {
  const elements = elementsOf(circuit);
  const rawPositions = layout && typeof layout === 'object' ? (layout as { positions?: unknown }).positions : undefined;
  const stored: Record<string, XY> = {};
  if (rawPositions && typeof rawPositions === 'object') {
    for (const [k, v] of Object.entries(rawPositions as Record<string, unknown>)) {
      const p = v as Partial<XY> | null;
      if (p && typeof p.x === 'number' && typeof p.y === 'number' && Number.isFinite(p.x) && Number.isFinite(p.y)) stored[k] = { x: p.x, y: p.y };
    }
  }
  const { buses, elements: at } = place(elements, stored);
  const parts: string[] = [];
  const font = `font-family="${escapeXml(fontFamily)}"`;
  const labels: DiagramLabel[] = [];
  const label = (l: DiagramLabel) => {
    labels.push(l);
    if (inSvg) parts.push(`<text x="${l.x}" y="${l.y}" font-size="${l.size}"${l.bold ? ' font-weight="bold"' : ''}${l.colour ? ` fill="${l.colour}"` : ''} ${font}>${escapeXml(l.text)}</text>`);
  };
  // Wires first, then buses, then symbols and labels on top.
  for (const e of elements) {
    const p = at.get(e.id)!;
    for (const b of e.buses) {
      const q = buses.get(b)!;
      parts.push(`<polyline points="${p.x},${p.y} ${p.x},${(p.y + q.y) / 2} ${q.x},${(p.y + q.y) / 2} ${q.x},${q.y}" fill="none" stroke="black" stroke-width="0.8"/>`);
    }
  }
  for (const [name, q] of buses) {
    const half = Math.max(40, SLOT * 0.6);
    parts.push(`<line x1="${q.x - half}" y1="${q.y}" x2="${q.x + half}" y2="${q.y}" stroke="black" stroke-width="4"/>`);
    label({ x: q.x - half, y: q.y - 6, text: name, size: 10, bold: true });
  }
  for (const e of elements) {
    const p = at.get(e.id)!;
    parts.push(symbol(e.type, p));
    label({ x: p.x + 16, y: p.y + 3, text: e.id, size: 9 });
    if (e.opened.length) label({ x: p.x + 16, y: p.y + 14, text: `${conductorWords(e.opened)} open`, size: 8, colour: '#b00020' });
  }
  const xs = [...buses.values(), ...at.values()].map((p) => p.x);
  const ys = [...buses.values(), ...at.values()].map((p) => p.y);
  const minX = Math.min(0, ...xs) - SLOT * 0.7;
  const minY = Math.min(0, ...ys) - 30;
  const width = Math.max(...xs, 0) - minX + 160;
  const height = Math.max(...ys, 0) - minY + 40;
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="${minX} ${minY} ${width} ${height}">${parts.join('')}</svg>`;
  return { svg, width, height, minX, minY, labels };
}
