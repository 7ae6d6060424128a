/**
 * Typed engine errors. Every message names the element or node a user can fix.
 * `code` is stable and machine-readable; the CLI maps `invalid-circuit` to exit 2 and the others to exit 3.
 */
export type EngineErrorCode = 'invalid-circuit' | 'ill-posed-network' | 'singular-network' | 'non-convergence';

export class EngineError extends Error {
  readonly code: EngineErrorCode;
  /** Ids of the elements concerned (may be empty). */
  readonly elementIds: string[];
  /** Names of the nodes concerned (may be empty). */
  readonly nodes: string[];
  constructor(code: EngineErrorCode, message: string, opts: { elementIds?: string[]; nodes?: string[] } = {}) {
    super(message);
    this.name = new.target.name;
    this.code = code;
    this.elementIds = opts.elementIds ?? [];
    this.nodes = opts.nodes ?? [];
  }
}

/** The input does not follow the circuit format (schema errors, unknown types, NaN, unknown nodes…). */
export class InvalidCircuitError extends EngineError {
  /** Field-level problems: a JSON path and a plain-words message each. */
  readonly issues: { path: string; message: string }[];
  constructor(message: string, issues: { path: string; message: string }[] = [], opts: { elementIds?: string[]; nodes?: string[] } = {}) {
    super('invalid-circuit', message, opts);
    this.issues = issues;
  }
}

/** The network has no unique solution by construction: ideal sources in a loop, a source shorted by a switch, a loop of zero impedance… */
export class IllPosedNetworkError extends EngineError {
  constructor(message: string, opts: { elementIds?: string[]; nodes?: string[] } = {}) {
    super('ill-posed-network', message, opts);
  }
}

/** The factorisation met a zero pivot that the structural checks did not foresee. */
export class SingularNetworkError extends EngineError {
  constructor(message: string, opts: { elementIds?: string[]; nodes?: string[] } = {}) {
    super('singular-network', message, opts);
  }
}

/** Voltage-dependent loads did not converge (for example voltage collapse); names the worst mismatch. */
export class NonConvergenceError extends EngineError {
  constructor(message: string, opts: { elementIds?: string[]; nodes?: string[] } = {}) {
    super('non-convergence', message, opts);
  }
}

/**
 * Voltage collapse: the voltage-dependent loads ask for more than the network can deliver and no
 * solution was found. `noseLoadFactor` is the largest fraction of the rated load for which
 * continuation found a solution (the nose of the load-level/voltage curve); `noseVoltagesPu` the
 * loads' terminal voltages there, lowest first.
 */
export class VoltageCollapseError extends NonConvergenceError {
  readonly noseLoadFactor: number;
  readonly noseVoltagesPu: { id: string; pu: number }[];
  constructor(message: string, noseLoadFactor: number, noseVoltagesPu: { id: string; pu: number }[], opts: { elementIds?: string[]; nodes?: string[] } = {}) {
    super(message, opts);
    this.noseLoadFactor = noseLoadFactor;
    this.noseVoltagesPu = noseVoltagesPu;
  }
}
