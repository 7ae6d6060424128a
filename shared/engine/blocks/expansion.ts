/**
 * What a building block (or a bare primitive) becomes: primitives plus the bookkeeping needed to
 * report results per block (ports, categories, phase labels).
 */
import type { Cx, Primitive } from '../types.ts';
import type { Circuit, ElementType } from '../schema/circuit.ts';

/** How the power of an element is counted in the totals. */
export type ElementCategory = 'source' | 'load' | 'series' | 'fault' | 'earthing';

/** A primitive produced by an expansion, with the phase it belongs to (for per-phase power) and its role. */
export interface TaggedPrimitive {
  prim: Primitive;
  /** Phase label for per-phase power ('a', 'b', 'c', 'ab', '1', …). */
  phase?: string;
  /** 'emf': source EMF (its power is source power); 'earth': bond to earth (its current is earth current); 'winding': transformer unit. */
  role?: 'emf' | 'earth' | 'winding';
  /** Set when the primitive is left out of the solve (a solid earth bond merged with an earlier one); says which. */
  mergedInto?: string;
}

/** A connection of a block to a bus: one node per conductor. */
export interface Port {
  /** The bus, when the port is a bus connection (absent for a bare node). */
  bus?: string;
  conductors: string[];
  nodes: string[];
}

/** Transformer data needed for loading (per winding rated currents, A). */
export interface TransformerMeta {
  kind: 'transformer';
  /** Per unit: the HV and LV terminal nodes at which winding current is read, with rated winding currents (A). */
  windings: { primId: string; hvIndex: number; lvIndexes: number[]; hvRatedAmps: number; lvRatedAmps: number }[];
  /** The phase shift in force, in degrees by which LV lags HV for an ABC system (IEC clock × 30). */
  lagDeg: number;
  convention: 'iec' | 'northAmerican';
  vectorGroup: string;
  /** HV tap in force, % of the rated ratio (three-phase banks). */
  tapPercent?: number;
}

/** Loads: each branch's terminals and rated voltage, so results can give the voltage across the load itself. */
export interface LoadMeta {
  kind: 'load';
  bus: string;
  connection: 'wye' | 'wyeFloating' | 'delta' | 'single';
  branches: {
    /** Branch label ('a', 'ab', 'cn', …), as in `powerPerPhase`. */
    key: string;
    /** Conductors of the bus at each end ('star' for a floating wye's own star point). */
    fromConductor: string;
    toConductor: string;
    fromNode: string;
    toNode: string;
    /** Rated voltage across the branch, V, and whether it came from the load's own rating or the bus nominal. */
    ratedVolts?: number;
    ratedFrom?: 'load' | 'bus';
  }[];
}

export interface FaultMeta {
  kind: 'fault';
  faultKind: string;
  bus: string;
  phases: string[];
}

/** The expansion of one circuit element. */
export interface Expansion {
  id: string;
  type: ElementType;
  category: ElementCategory;
  primitives: TaggedPrimitive[];
  /** Ports of a block; undefined for a bare primitive (its currents are the solver's). */
  ports?: Port[];
  /** Block currents are reported into the element at each port, except for sources (out of the source into the bus). */
  currentDirection: 'into-element' | 'out-of-element' | 'primitive';
  meta?: TransformerMeta | FaultMeta | LoadMeta;
}

/** Nominal voltages of a bus. */
export interface BusNominal {
  /** Line-to-line (split-phase: leg-to-leg) nominal, V. */
  vLL: number;
  /** Line-to-neutral (split-phase: leg-to-neutral) nominal, V. */
  vLN: number;
}

/** Everything an expansion needs besides its element. */
export interface ExpandContext {
  circuit: Circuit;
  frequencyHz: number;
  sequence: 'ABC' | 'ACB';
  nominal: Map<string, BusNominal>;
  /** True when the bus has split-phase conductors (1, 2). */
  splitPhase: Set<string>;
}

/** Node name of conductor `c` of bus `bus`. */
export const busNode = (bus: string, c: string): string => `${bus}.${c}`;

/** Angle offsets of phases a, b, c for the system sequence (degrees). */
export function phaseOffsetsDeg(sequence: 'ABC' | 'ACB'): [number, number, number] {
  return sequence === 'ABC' ? [0, -120, 120] : [0, 120, -120];
}

export type { Cx };
