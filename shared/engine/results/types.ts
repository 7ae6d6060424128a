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
  /**
   * Sequence components of the line-to-neutral voltages, relative to this bus's neutral (three-phase
   * buses with a, b, c and n). With the neutral shifted these differ from `sequence` by V0 only:
   * V0(to neutral) = V0(to earth) − V(n-earth), while V1 and V2 are the same.
   */
  sequenceToNeutral?: SequenceResult;
  /**
   * Why this bus's neutral sits where it does (buses with a neutral): 'open-neutral' when its
   * neutral is cut off from every source neutral by an opened neutral conductor (`neutralOpenAt`
   * names the lines or switches), 'floating-neutral' when it was never joined to one, 'fault' when
   * it is joined and the study has a fault, 'unbalance' when it is joined and the shift is the
   * unbalanced load current through the neutral path.
   */
  neutralCause?: NeutralCause;
  /** Lines and switches whose neutral conductor is open at the edge of this bus's neutral ('open-neutral'). */
  neutralOpenAt?: string[];
  /** IEC unbalance factor |V2|/|V1|, %. */
  iecUnbalancePercent?: number;
  /** Line-voltage unbalance (NEMA MG 1 definition), %. */
  nemaUnbalancePercent?: number;
  /** Phase-voltage unbalance (IEEE definition, on line-to-neutral magnitudes), %. */
  ieeeUnbalancePercent?: number;
  /** True when the bus lies in a floating part (voltages to earth then rest on the documented reference). */
  floating: boolean;
}

/** What holds (or fails to hold) a bus's neutral; see `BusResult.neutralCause`. */
export type NeutralCause = 'open-neutral' | 'floating-neutral' | 'fault' | 'unbalance';

/** Currents of a block at one bus connection. */
export interface PortResult {
  bus?: string;
  conductors: string[];
  nodes: string[];
  currents: Phasor[];
  /** Sequence components of the phase currents a, b, c at this port (ports with all three). */
  sequence?: SequenceResult;
}

/** The voltage across one branch of a load, at its own terminals. */
export interface LoadBranchResult {
  /** Branch label: 'a' (wye phase to its star point), 'ab' (delta), 'cn' (single-phase between c and n). */
  branch: string;
  /** Conductors at the load's connection ('star' for the own star point of a floating wye). */
  fromConductor: string;
  toConductor: string;
  /** V(from) − V(to), RMS. */
  voltage: Phasor;
  /** Rated voltage of the branch, V: from the load's own rating (kvLL, ratedVolts) or the bus nominal. */
  ratedVolts?: number;
  ratedFrom?: 'load' | 'bus';
  /** |voltage| / ratedVolts. */
  pu?: number;
  /** Against the limit set's voltage bands, in pu of the branch's rating. */
  status: 'ok' | 'warning-high' | 'warning-low' | 'violation-high' | 'violation-low' | 'unrated';
}

/** Per load: the voltage across each of its branches. */
export interface LoadResult {
  id: string;
  /** The bus the load is connected to (as the circuit names it). */
  bus: string;
  connection: 'wye' | 'wyeFloating' | 'delta' | 'single';
  branches: LoadBranchResult[];
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
  /** Three-phase banks with a tap: the HV tap in force, % of the rated ratio. */
  tapPercent?: number;
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
  code: 'voltage-low' | 'voltage-high' | 'unbalance' | 'neutral-shift' | 'overload' | 'floating' | 'load-low-voltage' | 'load-voltage-high' | 'load-voltage-low';
  /** Unbalance flags: the definition that is over its limit. */
  metric?: 'iec' | 'nema' | 'ieee';
  /** Neutral-shift flags: the cause (see `BusResult.neutralCause`). */
  cause?: NeutralCause;
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
  /** Per load, the voltage across its own terminals against its rating. */
  loads: LoadResult[];
  faults: FaultResult[];
  totals: Totals;
  floating: FloatingIsland[];
  flags: Flag[];
  limits: LimitSet;
  iterations: number;
}
