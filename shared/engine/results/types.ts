/**
 * The typed result of `solveCircuit`. All phasors RMS, complex and polar; powers in VA with
 * S = V·I* in load convention (Q > 0 lagging) unless a field says "delivered".
 */
import type { Phasor } from '../phasor.ts';
import type { FloatingIsland } from '../types.ts';
import type { LimitSet } from '../limits/limit-sets.ts';
import type { ElementCategory } from '../blocks/expansion.ts';

/** Sequence components of a three-phase set. */
export interface SequenceResult {
  zero: Phasor;
  positive: Phasor;
  negative: Phasor;
}

/** Per-bus voltages and unbalance. */
export interface BusResult {
  bus: string;
  kind: 'threePhase' | 'splitPhase';
  /** Nominal line-to-line (split-phase: leg-to-leg) voltage, V, if known. */
  nominalVLL?: number;
  /** Nominal line-to-neutral (split-phase: leg-to-neutral) voltage, V, if known. */
  nominalVLN?: number;
  /** Conductors present in the network. */
  conductors: string[];
  /** Voltage to earth per conductor. */
  toEarth: Record<string, Phasor>;
  /** Phase (or leg) to neutral, or to earth when the bus has no neutral conductor (see `lnReference`). */
  lineToNeutral: Record<string, Phasor>;
  lnReference: 'neutral' | 'earth';
  /** Line-to-line voltages (ab, bc, ca; split-phase: "12"). */
  lineToLine: Record<string, Phasor>;
  /** Neutral-to-earth voltage (the neutral shift). */
  neutralToEarth?: Phasor;
  /** |V_n-earth| in % of nominal V_LN. */
  neutralShiftPercent?: number;
  /** Sequence components of the phase-to-earth voltages (three-phase buses with a, b, c). */
  sequence?: SequenceResult;
  /** IEC unbalance factor |V2|/|V1|, %. */
  iecUnbalancePercent?: number;
  /** Line-voltage unbalance (NEMA MG 1 definition), %. */
  nemaUnbalancePercent?: number;
  /** Phase-voltage unbalance (IEEE definition, on line-to-neutral magnitudes), %. */
  ieeeUnbalancePercent?: number;
  /** True when the bus lies in a floating part (voltages to earth then rest on the documented reference). */
  floating: boolean;
}

/** Currents of a block at one bus connection. */
export interface PortResult {
  bus?: string;
  conductors: string[];
  nodes: string[];
  currents: Phasor[];
}

/** Per-element results. */
export interface ElementResult {
  id: string;
  type: string;
  category: ElementCategory;
  /**
   * One current per conductor of each port (ports in order), or the solver's currents for a
   * primitive. Direction: see `currentDirection`.
   */
  currents: Phasor[];
  currentDirection: 'into-element' | 'out-of-element' | 'primitive';
  ports?: PortResult[];
  /** Current from the element into earth (earthing bonds, earth faults). */
  earthCurrent?: Phasor;
  /** Sequence components of the phase currents at the first port with a, b, c. */
  sequenceCurrents?: SequenceResult;
  /** Complex power absorbed by the element (load convention), VA; for sources the power they deliver at their terminals. */
  power: Phasor;
  /** Loads, capacitor banks, faults: current of each branch (label → A), from its first to its second conductor (delta: ab, bc, ca). */
  branchCurrents?: Record<string, Phasor>;
  /** Per phase (branch label → VA): absorbed for loads, EMF power delivered for sources. */
  powerPerPhase?: Record<string, Phasor>;
  /** Sources: power delivered by the EMFs (before internal impedance), VA. */
  emfPower?: Phasor;
  /** Series elements (lines, transformers, switches) and source internal impedance: losses, VA. */
  losses?: Phasor;
  /** Transformers: highest winding current in % of its rating. */
  loadingPercent?: number;
  /** Transformers: the phase shift in force. */
  phaseShift?: { convention: 'iec' | 'northAmerican'; vectorGroup: string; lvLagsHvDeg: number };
}

/** Fault results. */
export interface FaultResult {
  id: string;
  bus: string;
  kind: string;
  phases: string[];
  /** Current into the fault from each phase a, b, c (zero for unfaulted phases). */
  phaseCurrents: Record<'a' | 'b' | 'c', Phasor>;
  sequence: SequenceResult;
  /** Current from the fault into earth. */
  earthCurrent: Phasor;
}

/** A result outside a limit. */
export interface Flag {
  severity: 'info' | 'warning' | 'violation';
  code: 'voltage-low' | 'voltage-high' | 'unbalance' | 'neutral-shift' | 'overload' | 'floating' | 'load-low-voltage';
  bus?: string;
  elementId?: string;
  conductor?: string;
  value: number;
  limit?: number;
  unit: string;
  message: string;
}

export interface Totals {
  /** Power delivered by all source EMFs and current sources, VA. */
  sourcePower: Phasor;
  /** Power absorbed by loads, capacitor banks and bare impedances, VA. */
  loadPower: Phasor;
  /** Power absorbed at faults, VA. */
  faultPower: Phasor;
  /** Losses of series elements, source internal impedances and earth electrodes, VA. */
  losses: Phasor;
  /** source − load − fault − losses, VA (should be ~0). */
  powerBalanceResidual: Phasor;
  /** Largest KCL residual over all nodes, A. */
  maxKclResidualAmps: number;
}

/** The whole result of a circuit solve. */
export interface CircuitResult {
  name?: string;
  frequencyHz: number;
  conventions: {
    phasors: 'RMS';
    power: 'S = V·I*, load convention, Q > 0 lagging';
    sequence: 'ABC' | 'ACB';
    sequenceComponents: string;
    transformerShift: string;
  };
  nodes: Record<string, Phasor>;
  buses: BusResult[];
  elements: Record<string, ElementResult>;
  faults: FaultResult[];
  totals: Totals;
  floating: FloatingIsland[];
  flags: Flag[];
  limits: LimitSet;
  iterations: number;
}
