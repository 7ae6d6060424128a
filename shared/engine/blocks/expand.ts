/** Expand every element of a validated circuit into primitives (one `Expansion` per element). */
import { InvalidCircuitError } from '../errors.ts';
import type { Primitive } from '../types.ts';
import type { Circuit } from '../schema/circuit.ts';
import { toCx } from '../schema/to-cx.ts';
import { expandCapacitorBank } from './capacitor-bank.ts';
import { expandEarthingElectrode } from './earthing.ts';
import type { ExpandContext, Expansion } from './expansion.ts';
import { expandFault } from './fault.ts';
import { expandLine } from './line.ts';
import { expandLoad } from './load.ts';
import { inferNominals, splitPhaseBuses } from './nominal.ts';
import { expandSource } from './source.ts';
import { expandSplitPhaseSource } from './split-phase-source.ts';
import { expandSplitPhaseTransformer } from './split-phase-transformer.ts';
import { expandSwitch3 } from './switch3.ts';
import { expandTransformer } from './transformer.ts';
import { isZero } from '../phasor.ts';

/** Normalise a primitive from the file (complex forms → {re, im}) and check its shape. */
function primitiveFromFile(el: Extract<Circuit['elements'][number], { type: Primitive['type'] }>): Primitive {
  const bad = (msg: string): never => {
    throw new InvalidCircuitError(`${el.type} ${el.id}: ${msg}`, [], { elementIds: [el.id] });
  };
  switch (el.type) {
    case 'impedance': {
      const ohms = toCx(el.ohms);
      if (isZero(ohms)) bad('zero impedance: use a closed switch for an ideal connection');
      if (el.from === el.to) bad('"from" and "to" are the same node');
      return { ...el, ohms };
    }
    case 'voltageSource':
      if (el.plus === el.minus) bad('"plus" and "minus" are the same node');
      {
      const { seriesOhms, ...restV } = el;
      return { ...restV, volts: toCx(el.volts), ...(seriesOhms !== undefined ? { seriesOhms: toCx(seriesOhms) } : {}) };
    }
    case 'currentSource':
      return { ...el, amps: toCx(el.amps) };
    case 'coupledBranch': {
      const n = el.from.length;
      if (el.to.length !== n) bad(`"from" has ${n} nodes but "to" has ${el.to.length}`);
      if (el.ohms.length !== n || el.ohms.some((r) => r.length !== n)) bad(`"ohms" must be a ${n}×${n} matrix`);
      return { ...el, ohms: el.ohms.map((r) => r.map(toCx)) };
    }
    case 'switch':
      if (el.from === el.to) bad('"from" and "to" are the same node');
      return { ...el };
    case 'admittanceMatrix': {
      const n = el.nodes.length;
      if (el.siemens.length !== n || el.siemens.some((r) => r.length !== n)) bad(`"siemens" must be a ${n}×${n} matrix`);
      return { ...el, siemens: el.siemens.map((r) => r.map(toCx)) };
    }
    case 'zipLoad': {
      const zip = el.zip ?? { z: 1, i: 0, p: 0 };
      if (Math.abs(zip.z + zip.i + zip.p - 1) > 1e-9) bad('the ZIP fractions must sum to 1');
      if (el.from === el.to) bad('"from" and "to" are the same node');
      return { ...el, ratedVA: toCx(el.ratedVA), zip };
    }
  }
}

const PRIMITIVE_CATEGORY = {
  impedance: 'load',
  zipLoad: 'load',
  admittanceMatrix: 'load',
  voltageSource: 'source',
  currentSource: 'source',
  coupledBranch: 'series',
  switch: 'series',
} as const;

/** Build the expansion context (nominal voltages, split-phase buses). */
export function expandContext(circuit: Circuit): ExpandContext {
  const splitPhase = splitPhaseBuses(circuit);
  return { circuit, frequencyHz: circuit.frequencyHz, sequence: circuit.sequence, nominal: inferNominals(circuit, splitPhase), splitPhase };
}

/** Expand one element. */
export function expandElement(el: Circuit['elements'][number], ctx: ExpandContext): Expansion {
  switch (el.type) {
    case 'source':
      return expandSource(el, ctx);
    case 'splitPhaseSource':
      return expandSplitPhaseSource(el);
    case 'line':
      return expandLine(el, ctx);
    case 'transformer':
      return expandTransformer(el);
    case 'splitPhaseTransformer':
      return expandSplitPhaseTransformer(el);
    case 'load':
      return expandLoad(el, ctx);
    case 'capacitorBank':
      return expandCapacitorBank(el, ctx);
    case 'fault':
      return expandFault(el);
    case 'switch3':
      return expandSwitch3(el);
    case 'earthing':
      return expandEarthingElectrode(el);
    default: {
      const prim = primitiveFromFile(el);
      return { id: el.id, type: el.type, category: PRIMITIVE_CATEGORY[el.type], primitives: [{ prim, role: el.type === 'voltageSource' ? 'emf' : undefined }], currentDirection: 'primitive' };
    }
  }
}

/** Expand every element; checks that the generated primitive ids are unique. */
export function expandCircuit(circuit: Circuit, ctx: ExpandContext = expandContext(circuit)): { expansions: Expansion[]; primitives: Primitive[] } {
  const expansions = circuit.elements.map((el) => expandElement(el, ctx));
  const primitives = expansions.flatMap((e) => e.primitives.map((t) => t.prim));
  const seen = new Map<string, string>();
  for (const e of expansions)
    for (const t of e.primitives) {
      const other = seen.get(t.prim.id);
      if (other !== undefined) throw new InvalidCircuitError(`element ids clash: "${t.prim.id}" (from ${e.id}) is also used by ${other}; rename one of them`, [], { elementIds: [e.id, other] });
      seen.set(t.prim.id, e.id);
    }
  return { expansions, primitives };
}
