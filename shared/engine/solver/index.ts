/**
 * The engine's numerical core: a primitive-level complex nodal solver.
 *
 * - `solvePrimitives(primitives, options)` solves once.
 * - `createNetwork(primitives)` prepares a topology for repeated solves (`update` values, `solve`),
 *   caching the ordering and the symbolic factorization.
 * Conventions (currents per kind, earth = 0 V, floating islands) are those of ../types.ts.
 */
export {
  createNetwork,
  solvePrimitives,
  solutionArrays,
  type SolutionArrays,
  DEFAULT_LOW_VOLTAGE_PU,
  DEFAULT_MAX_ITERATIONS,
  DEFAULT_TOLERANCE,
  type Network,
  type SolverOptions,
  type SolveTimings,
} from './network.ts';
