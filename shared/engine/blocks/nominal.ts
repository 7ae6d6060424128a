/**
 * Nominal voltages of buses: from the `buses` list, else from sources and transformers, then
 * carried across lines and multi-conductor switches (they join buses of one voltage level).
 * Split-phase buses: `kvLL` is the leg-to-leg voltage and the leg-to-neutral nominal is half of it.
 */
import type { Circuit } from '../schema/circuit.ts';
import type { BusNominal } from './expansion.ts';

const isLeg = (c: string) => c === '1' || c === '2';

/** Conductors a line carries (before any are opened). */
function lineConductors(el: Extract<Circuit['elements'][number], { type: 'line' }>): string[] {
  const imp = el.impedance;
  if (imp.kind === 'perConductor') return Object.keys(imp.ohmsPerLength);
  if (imp.kind === 'matrix') return imp.conductors;
  if (imp.kind === 'carson') return imp.conductors.map((c) => c.conductor);
  return ['a', 'b', 'c'];
}

/** Buses with split-phase conductors (1, 2): fed by split-phase blocks, or joined to such buses by lines and switches carrying legs. */
export function splitPhaseBuses(circuit: Circuit): Set<string> {
  const s = new Set<string>();
  for (const el of circuit.elements) {
    if (el.type === 'splitPhaseSource') s.add(el.bus);
    else if (el.type === 'splitPhaseTransformer') s.add(el.to);
    else if (el.type === 'load' && el.between?.some(isLeg)) s.add(el.bus);
    else if ((el.type === 'line' && lineConductors(el).some(isLeg)) || (el.type === 'switch3' && el.conductors.some(isLeg))) {
      s.add(el.from);
      s.add(el.to);
    }
  }
  return s;
}

/** Nominal voltages (V) of every bus whose voltage level can be told. */
export function inferNominals(circuit: Circuit, split: Set<string>): Map<string, BusNominal> {
  const out = new Map<string, BusNominal>();
  const set = (bus: string, kvLL: number, force = false) => {
    if (out.has(bus) && !force) return;
    const vLL = kvLL * 1000;
    out.set(bus, { vLL, vLN: split.has(bus) ? vLL / 2 : vLL / Math.sqrt(3) });
  };
  for (const b of circuit.buses ?? []) if (b.kvLL !== undefined) set(b.name, b.kvLL, true);
  for (const el of circuit.elements) {
    if (el.type === 'source') set(el.bus, el.kvLL);
    else if (el.type === 'splitPhaseSource') set(el.bus, (2 * el.voltsLN) / 1000);
    else if (el.type === 'transformer') {
      set(el.from, el.kvHigh);
      set(el.to, el.kvLow);
    } else if (el.type === 'splitPhaseTransformer') {
      set(el.to, el.lowVolts / 1000);
      set(el.from, el.primary.includes('n') ? el.kvHigh * Math.sqrt(3) : el.kvHigh);
    }
  }
  // Carry nominals across lines and switches (same voltage level on both ends): breadth-first.
  const adj = new Map<string, string[]>();
  const link = (x: string, y: string) => {
    if (!adj.has(x)) adj.set(x, []);
    adj.get(x)!.push(y);
  };
  for (const e of circuit.elements) {
    if (e.type === 'line' || e.type === 'switch3') {
      link(e.from, e.to);
      link(e.to, e.from);
    }
  }
  const queue = [...out.keys()];
  for (let k = 0; k < queue.length; k++) {
    const nom = out.get(queue[k])!;
    for (const next of adj.get(queue[k]) ?? []) {
      if (out.has(next)) continue;
      set(next, nom.vLL / 1000);
      queue.push(next);
    }
  }
  return out;
}
