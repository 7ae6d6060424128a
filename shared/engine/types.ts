/**
 * Core types shared by every part of the engine.
 *
 * Conventions (stated once, used everywhere):
 * - Phasors are RMS, complex, in volts / amperes / ohms / siemens.
 * - Node names are strings; `"earth"` is the reference node (0 V).
 * - Complex power S = V·I* in load convention; Q > 0 is lagging (inductive).
 */

/** A complex number (rectangular). */
export interface Cx {
  re: number;
  im: number;
}

/** The reference node: every node voltage is measured to it. */
export const EARTH = 'earth';

/** Impedance between two nodes; its current flows from `from` to `to`. */
export interface ImpedancePrimitive {
  type: 'impedance';
  id: string;
  from: string;
  to: string;
  /** Impedance in ohms; must be non-zero (use a switch for a closed connection). */
  ohms: Cx;
}

/**
 * Ideal voltage source V(plus) − V(minus) = volts, optionally behind a series impedance
 * (then the EMF sits behind `seriesOhms` and the terminal voltage drops with current).
 * Its current is the current leaving `plus` into the circuit.
 */
export interface VoltageSourcePrimitive {
  type: 'voltageSource';
  id: string;
  plus: string;
  minus: string;
  /** EMF in volts (RMS phasor). */
  volts: Cx;
  /** Optional internal series impedance in ohms. */
  seriesOhms?: Cx;
}

/** Ideal current source; `amps` flows through the source from `from` to `to` (it enters the circuit at `to`). */
export interface CurrentSourcePrimitive {
  type: 'currentSource';
  id: string;
  from: string;
  to: string;
  /** Current in amperes (RMS phasor). */
  amps: Cx;
}

/**
 * Coupled multi-conductor series branch: conductor k runs from `from[k]` to `to[k]`, and
 * V(from) − V(to) = Z · I with the full n×n impedance matrix (mutual terms off the diagonal).
 * Its currents are one per conductor, from `from[k]` to `to[k]`.
 */
export interface CoupledBranchPrimitive {
  type: 'coupledBranch';
  id: string;
  from: string[];
  to: string[];
  /** n×n series impedance matrix in ohms (symmetric for ordinary lines). */
  ohms: Cx[][];
}

/** Switch between two nodes; a closed switch is an ideal short, an open one carries no current. Current flows from `from` to `to`. */
export interface SwitchPrimitive {
  type: 'switch';
  id: string;
  from: string;
  to: string;
  closed: boolean;
}

/**
 * A nodal admittance stamp over a set of nodes: the currents flowing from each node into the
 * element are I = Y · V(nodes). Used for transformer windings and line shunt admittance.
 * Its currents are one per node, in `nodes` order, flowing from the node into the element.
 */
export interface AdmittanceMatrixPrimitive {
  type: 'admittanceMatrix';
  id: string;
  nodes: string[];
  /** n×n nodal admittance matrix in siemens. */
  siemens: Cx[][];
}

/**
 * A voltage-dependent two-terminal load between `from` and `to` (current flows from `from` to `to`).
 * At rated voltage it draws `ratedVA` (S = V·I*, load convention). `zip` splits that power into
 * constant-impedance, constant-current and constant-power parts (fractions summing to 1).
 */
export interface ZipLoadPrimitive {
  type: 'zipLoad';
  id: string;
  from: string;
  to: string;
  /** Voltage magnitude (V) at which `ratedVA` is drawn. */
  ratedVolts: number;
  /** Complex power (VA) drawn at rated voltage, load convention. */
  ratedVA: Cx;
  /** Fractions of constant impedance (z), current (i) and power (p); z + i + p = 1. */
  zip: { z: number; i: number; p: number };
}

/** The network elements the solver understands directly; building blocks expand into these. */
export type Primitive =
  | ImpedancePrimitive
  | VoltageSourcePrimitive
  | CurrentSourcePrimitive
  | CoupledBranchPrimitive
  | SwitchPrimitive
  | AdmittanceMatrixPrimitive
  | ZipLoadPrimitive;

/** A part of the network with no path to earth, solved with one of its nodes taken as 0 V to earth. */
export interface FloatingIsland {
  /** Every node of the island. */
  nodes: string[];
  /** The node held at 0 V to earth so that the island can be solved (documented reference). */
  referenceNode: string;
}

/** Options for the iterative part of the solution (voltage-dependent loads). */
export interface SolveOptions {
  /** Convergence tolerance on the largest node-voltage change, per unit of the node's rated voltage (default 1e-9). */
  tolerance?: number;
  /** Iteration limit for voltage-dependent loads (default 100). */
  maxIterations?: number;
}

/**
 * A voltage-dependent load whose terminal voltage ended below the low-voltage threshold, where its
 * constant-current and constant-power parts were converted to constant impedance (common practice).
 */
export interface LowVoltageLoad {
  /** Id of the zipLoad primitive. */
  id: string;
  /** Its terminal voltage, per unit of its ratedVolts. */
  voltsPu: number;
  /** The threshold in force, per unit. */
  lowVoltagePu: number;
}

/** The solution of a network of primitives. */
export interface PrimitiveSolution {
  /** Voltage to earth of every node (earth included, at 0 V). */
  nodeVolts: Map<string, Cx>;
  /** Currents of every primitive, with the per-kind conventions documented on each primitive type. */
  elementCurrents: Map<string, Cx[]>;
  /** Parts of the network with no path to earth. */
  floating: FloatingIsland[];
  /** Iterations used for voltage-dependent loads (1 for a linear network). */
  iterations: number;
  /** Largest KCL residual over all nodes, in amperes (a self-check of the solution). */
  maxKclResidualAmps: number;
  /** Zip loads (with constant-current or constant-power parts) solved below the low-voltage threshold; absent or empty when none. */
  lowVoltageLoads?: LowVoltageLoad[];
}
