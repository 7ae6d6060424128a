/**
 * The engine's one public API: circuit format (schemas, types), solveCircuit, results types,
 * errors, metrics helpers, limit sets, demo circuits, and the primitive solver.
 * Conventions: RMS phasors; earth is the reference node; S = V·I* in load convention (Q > 0
 * lagging); sequence ABC by default with a = 1∠120°.
 */
export * from './types.ts';
export * from './errors.ts';
export { solveCircuit, prepareCircuit, circuitResults, type SolveCircuitOptions, type PreparedCircuit } from './solve-circuit.ts';
export { prepareChanged, type PreparedChange } from './prepare-changed.ts';
export { parseCircuit, formatPath, type CircuitIssue } from './schema/parse-circuit.ts';
export {
  circuitSchema,
  elementSchema,
  elementSchemas,
  limitsSchema,
  busInfoSchema,
  ELEMENT_TYPES,
  type Circuit,
  type CircuitInput,
  type CircuitElement,
  type CircuitElementInput,
  type ElementType,
  type LimitsInput,
} from './schema/circuit.ts';
export { complexSchema, earthingSchema, CONDUCTORS, PHASES, type Conductor, type Phase, type ComplexInput, type EarthingInput } from './schema/common.ts';
export { toCx } from './schema/to-cx.ts';
export { casesSchema, studyCaseSchema, caseChangeSchema, BASE_CASE_ID, type StudyCase, type CaseChange } from './schema/cases.ts';
export { applyCase, circuitCases, caseLabel } from './cases/apply-case.ts';
export { setPath, getPath, resolveParameter, type ParameterPath } from './cases/set-path.ts';
export { sweepValues, sweepPoints, sweepCircuit, MAX_SWEEP_POINTS, type SweepParameter } from './cases/sweep-points.ts';
export { createSweepSolver, sweepOutputValue, type SweepOutputSpec, type SweepPointRow } from './cases/sweep-solver.ts';
export { lostNeutralEnvelope, MAX_ENVELOPE_COMBINATIONS, type EnvelopeOptions, type EnvelopeLoad, type LostNeutralEnvelope } from './cases/envelope.ts';
export { circuitJsonSchema } from './schema/json-schema.ts';
export * from './schema/blocks.ts';
export * from './schema/primitives.ts';
export type * from './results/types.ts';
export { isPrimitiveOnly, printedPrimitiveResults, type PrintedPrimitiveResult } from './results/printed-primitives.ts';
export { printedPrimitiveResultOfText } from './typed/printed-scanned.ts';
export { type Phasor, toPhasor, polar, cx } from './phasor.ts';
export { sequenceComponents, phasesFromSequence, type SequenceComponents } from './metrics/sequence.ts';
export { iecUnbalancePercent, maxDeviationUnbalancePercent, iecUnbalanceFromLineMagnitudesPercent } from './metrics/unbalance.ts';
export { ANSI_C84_1, IEC_EN, resolveLimits, UNBALANCE_METRICS, type LimitSet, type UnbalanceMetric } from './limits/limit-sets.ts';
export { UNBALANCE_NAMES, unbalanceOf } from './limits/flags.ts';
export { carsonPrimitiveMatrix, kronReduce, type CarsonConductor } from './blocks/carson.ts';
export { busNode } from './blocks/expansion.ts';
export { demoCircuits, balancingFeeder, balancingCustomersCsv, type DemoCircuit } from './examples/index.ts';
export {
  solvePrimitives,
  createNetwork,
  DEFAULT_TOLERANCE,
  DEFAULT_MAX_ITERATIONS,
  DEFAULT_LOW_VOLTAGE_PU,
  type Network,
  type SolverOptions,
  type SolveTimings,
} from './solver/index.ts';
export * from './balancing/index.ts';
