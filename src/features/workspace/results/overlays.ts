/**
 * What the canvas draws on top of the diagram after a solve (contract 4): per bus the
 * line-to-neutral magnitudes, the neutral shift and the worst flag; per element the currents per
 * conductor and its flags. Plain data, so the canvas nodes stay simple and memoisable.
 */
import type { CircuitResult, Flag, LoadBranchResult } from '../../../../shared/engine/index.ts';

/** Overlay of one bus. */
export interface BusOverlay {
  bus: string;
  /** |V| line-to-neutral (or to earth when the bus has no neutral) per phase, V. */
  vln: Record<string, number>;
  /** |V n-earth|, V (buses with a neutral). */
  neutralShiftV?: number;
  /** |V n-earth| in % of nominal V_LN. */
  neutralShiftPercent?: number;
  flags: Flag[];
  worstFlag?: Flag;
  /** True when the bus lies in a part with no path to earth. */
  floating: boolean;
}

/** One conductor current of an element, RMS. */
export interface ConductorCurrent {
  /** Index of the element's port (0 = first bus connection). */
  port: number;
  bus?: string;
  conductor: string;
  /** A. */
  mag: number;
  angleDeg: number;
}

/** Overlay of one element (id = canvas node id). */
export interface ElementOverlay {
  id: string;
  type: string;
  /** Direction of `currents`, as the engine reports it. */
  direction: 'into-element' | 'out-of-element' | 'primitive';
  currents: ConductorCurrent[];
  /** Transformers: highest winding current, % of rating. */
  loadingPercent?: number;
  /** Loads: the voltage across each branch at the load's own terminals, with its rating and verdict. */
  loadBranches?: LoadBranchResult[];
  flags: Flag[];
  worstFlag?: Flag;
}

export interface DiagramOverlays {
  buses: Record<string, BusOverlay>;
  elements: Record<string, ElementOverlay>;
}

const RANK: Record<Flag['severity'], number> = { info: 0, warning: 1, violation: 2 };

/** The most severe of a list of flags (first one wins a tie); undefined for none. */
export function worstFlag(flags: readonly Flag[]): Flag | undefined {
  let worst: Flag | undefined;
  for (const f of flags) if (!worst || RANK[f.severity] > RANK[worst.severity]) worst = f;
  return worst;
}

/** Overlay data for every bus and element of a result. */
export function diagramOverlays(result: CircuitResult): DiagramOverlays {
  // The flags by bus (those naming no element) and by element, in their order: one pass over them.
  const busFlags = new Map<string, Flag[]>();
  const elementFlags = new Map<string, Flag[]>();
  const into = (m: Map<string, Flag[]>, k: string, f: Flag) => {
    const list = m.get(k);
    if (list) list.push(f);
    else m.set(k, [f]);
  };
  for (const f of result.flags) {
    if (f.elementId) into(elementFlags, f.elementId, f);
    else if (f.bus !== undefined) into(busFlags, f.bus, f);
  }
  const buses: Record<string, BusOverlay> = {};
  for (const b of result.buses) {
    const flags = busFlags.get(b.bus) ?? [];
    const vln: Record<string, number> = {};
    for (const [ph, v] of Object.entries(b.lineToNeutral)) vln[ph] = v.mag;
    buses[b.bus] = {
      bus: b.bus,
      vln,
      neutralShiftV: b.neutralToEarth?.mag,
      neutralShiftPercent: b.neutralShiftPercent,
      flags,
      worstFlag: worstFlag(flags),
      floating: b.floating,
    };
  }
  const elements: Record<string, ElementOverlay> = {};
  const loadsById = new Map((result.loads ?? []).map((l) => [l.id, l] as const));
  for (const e of Object.values(result.elements)) {
    const flags = elementFlags.get(e.id) ?? [];
    const currents: ConductorCurrent[] = [];
    if (e.ports && e.ports.length > 0) {
      e.ports.forEach((p, port) =>
        p.conductors.forEach((conductor, i) => {
          const c = p.currents[i];
          if (c) currents.push({ port, bus: p.bus, conductor, mag: c.mag, angleDeg: c.angleDeg });
        }),
      );
    } else {
      e.currents.forEach((c, i) => currents.push({ port: 0, conductor: String(i + 1), mag: c.mag, angleDeg: c.angleDeg }));
    }
    const load = loadsById.get(e.id);
    elements[e.id] = { id: e.id, type: e.type, direction: e.currentDirection, currents, loadingPercent: e.loadingPercent, ...(load ? { loadBranches: load.branches } : {}), flags, worstFlag: worstFlag(flags) };
  }
  return { buses, elements };
}

/** Deep equality of plain data (JSON-like values: objects, arrays, numbers, strings, booleans, null, undefined). */
export function samePlain(a: unknown, b: unknown): boolean {
  if (Object.is(a, b)) return true;
  if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null) return false;
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  if (Array.isArray(a)) {
    const bb = b as unknown[];
    if (a.length !== bb.length) return false;
    for (let i = 0; i < a.length; i++) if (!samePlain(a[i], bb[i])) return false;
    return true;
  }
  const ka = Object.keys(a);
  if (ka.length !== Object.keys(b).length) return false;
  for (const k of ka) if (!Object.prototype.hasOwnProperty.call(b, k) || !samePlain((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k])) return false;
  return true;
}

/**
 * `next` with every bus and element overlay that equals its counterpart in `prev` replaced by that
 * counterpart, so canvas nodes whose values did not change see the same object and skip rendering.
 */
export function shareOverlays(prev: DiagramOverlays | null, next: DiagramOverlays): DiagramOverlays {
  if (!prev) return next;
  const pick = <T>(old: Record<string, T>, cur: Record<string, T>): Record<string, T> => {
    const out: Record<string, T> = {};
    for (const [k, v] of Object.entries(cur)) out[k] = k in old && samePlain(old[k], v) ? old[k] : v;
    return out;
  };
  return { buses: pick(prev.buses, next.buses), elements: pick(prev.elements, next.elements) };
}
