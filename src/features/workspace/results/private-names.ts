/**
 * The canvas turns a connection with an opened conductor into a switch and a private terminal bus
 * (names with a marker the user never types, e.g. "LOAD1~bus"). The results panel hides those
 * buses and elements from its lists and, when a selection lands on one, follows it to the bus
 * the user drew.
 */
import type { CircuitResult } from '../../../../shared/engine/index.ts';
import { circuitNames } from '../../../../shared/review/user-names.ts';

const escapeRe = (s: string) => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

/**
 * A generated name in words: "SRC1~bus~sw" and "SRC1~bus" → "the connection of SRC1"; a node
 * "KITCHEN~bus.n" → "the connection of KITCHEN (n)". Names without the marker are returned as they are.
 */
export function generatedNameWords(name: string, marker: string | undefined): string {
  if (!marker || !name.includes(marker)) return name;
  const owner = name.split(marker)[0];
  const dot = name.lastIndexOf('.');
  const conductor = dot > name.lastIndexOf(marker) ? name.slice(dot + 1) : '';
  return `the connection of ${owner}${conductor ? ` (${conductor})` : ''}`;
}

const INTERNAL_POINTS: Record<string, string> = { star: 'the star point', hvStar: 'the HV star point', lvStar: 'the LV star point', f: 'the fault point', a: 'the internal EMF terminal a', b: 'the internal EMF terminal b', c: 'the internal EMF terminal c' };

/**
 * An element's internal node in words: "PM-BANK#lvStar" → "the LV star point of PM-BANK",
 * "LD#star" → "the star point of LD" (the engine names the points a block adds with "#").
 */
export function internalPointWords(node: string): string {
  const i = node.lastIndexOf('#');
  if (i <= 0) return node;
  const owner = node.slice(0, i);
  return `${INTERNAL_POINTS[node.slice(i + 1)] ?? 'an internal point'} of ${owner}`;
}

/** A message with every generated name (anything containing `marker`) and internal point ("#") put in words. */
export function publicText(text: string, marker: string | undefined): string {
  let out = text;
  if (marker && out.includes(marker)) {
    const token = new RegExp(`[^\\s,;:()]*${escapeRe(marker)}[^\\s,;:()]*`, 'g');
    out = out.replace(token, (t) => generatedNameWords(t, marker));
  }
  return out.includes('#') ? out.replace(/[^\s,;:()#]+#[A-Za-z]+/g, (t) => internalPointWords(t)) : out;
}

/**
 * The result without buses and elements whose names contain `marker` (totals unchanged); flag
 * messages that name a private bus or switch are put in the words of the diagram
 * ("KITCHEN terminals at HOUSE", shared/review/user-names.ts), read from the result's own switches,
 * and internal points of a block ("#") in words; loads name the bus the user drew.
 */
export function hidePrivate(result: CircuitResult, marker: string | undefined): CircuitResult {
  if (!marker) return result;
  const names = circuitNames({
    elements: Object.values(result.elements).map((e) => ({ type: e.type, id: e.id, from: e.ports?.[0]?.bus, to: e.ports?.[1]?.bus })),
  });
  const internal = (t: string) => t.includes(marker) || t.includes('#');
  const inWords = (t: string) => publicText(t.includes(marker) ? names.text(t) : t, marker);
  const flags = result.flags.some((f) => internal(f.message)) ? result.flags.map((f) => (internal(f.message) ? { ...f, message: inWords(f.message) } : f)) : result.flags;
  const buses = result.buses.filter((b) => !b.bus.includes(marker));
  // Kept elements that sit behind a generated switch name the bus the user drew instead of the private one.
  const elements = Object.fromEntries(
    Object.entries(result.elements)
      .filter(([id]) => !id.includes(marker))
      .map(([id, e]) => {
        if (!e.ports?.some((p) => p.bus?.includes(marker))) return [id, e];
        const ports = e.ports.map((p) => (p.bus?.includes(marker) ? { ...p, bus: publicBus(result, p.bus, marker) ?? p.bus } : p));
        return [id, { ...e, ports }];
      }),
  );
  const loads = (result.loads ?? []).map((l) => (l.bus.includes(marker) ? { ...l, bus: publicBus(result, l.bus, marker) ?? l.bus } : l));
  const floating = result.floating.some((f) => f.nodes.some(internal) || internal(f.referenceNode))
    ? result.floating.map((f) => ({ ...f, nodes: [...new Set(f.nodes.map(inWords))], referenceNode: inWords(f.referenceNode) }))
    : result.floating;
  const busesShown = buses.length > 0 ? buses : result.buses;
  // Neutral causes name the lines and switches opened: a generated switch in words.
  const busesNamed = busesShown.map((b) => (b.neutralOpenAt?.some((id) => id.includes(marker)) ? { ...b, neutralOpenAt: b.neutralOpenAt.map((id) => generatedNameWords(id, marker)) } : b));
  // Never hide everything: a study made only of generated names still shows its results.
  return { ...result, buses: busesNamed, elements: Object.keys(elements).length > 0 ? elements : result.elements, loads, flags, floating };
}

/**
 * The bus the user drew for a bus name: itself when public, else the public bus joined to it by
 * an element (the generated switch), searched breadth-first; undefined when none is found.
 */
export function publicBus(result: CircuitResult, bus: string, marker: string | undefined): string | undefined {
  if (!marker || !bus.includes(marker)) return bus;
  const seen = new Set([bus]);
  let frontier = [bus];
  while (frontier.length > 0) {
    const next: string[] = [];
    for (const e of Object.values(result.elements)) {
      const names = (e.ports ?? []).map((p) => p.bus).filter((b): b is string => !!b);
      if (!names.some((n) => frontier.includes(n))) continue;
      for (const n of names) {
        if (seen.has(n)) continue;
        if (!n.includes(marker)) return n;
        seen.add(n);
        next.push(n);
      }
    }
    frontier = next;
  }
  return undefined;
}
