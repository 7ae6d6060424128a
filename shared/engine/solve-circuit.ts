/**
 * `solveCircuit(circuit, options)`: validate (zod schema), expand building blocks to primitives,
 * solve with the sparse nodal solver, build the typed results. Pure TypeScript: runs in the
 * browser, a Web Worker and Node alike.
 */
import { InvalidCircuitError } from './errors.ts';
import { EARTH, type Primitive, type PrimitiveSolution } from './types.ts';
import { parseCircuit } from './schema/parse-circuit.ts';
import type { Circuit, LimitsInput } from './schema/circuit.ts';
import { expandCircuit, expandContext } from './blocks/expand.ts';
import type { ExpandContext, Expansion } from './blocks/expansion.ts';
import { solvePrimitives, type SolverOptions } from './solver/index.ts';
import { resolveLimits } from './limits/limit-sets.ts';
import { buildResults } from './results/build-results.ts';
import { primitiveNodes } from './results/terminal-currents.ts';
import type { CircuitResult } from './results/types.ts';

/** Options of `solveCircuit`. */
export interface SolveCircuitOptions {
  /** Limit set and overrides (applied over the circuit file's own `limits`). */
  limits?: LimitsInput;
  /** Tolerance and iteration limit for voltage-dependent loads. */
  solver?: SolverOptions;
}

/** A validated and expanded circuit, ready for the solver. */
export interface PreparedCircuit {
  circuit: Circuit;
  context: ExpandContext;
  expansions: Expansion[];
  primitives: Primitive[];
}

/** A switch must join nodes that something else uses (a typo in a node name otherwise goes unnoticed). */
function checkSwitchNodes(circuit: Circuit, expansions: Expansion[]): void {
  if (!circuit.elements.some((el) => el.type === 'switch')) return;
  // count, per node, the primitives touching it (a primitive touching a node twice counts once)
  const uses = new Map<string, number>();
  for (const e of expansions)
    for (const t of e.primitives) {
      const nodes = primitiveNodes(t.prim);
      nodes.forEach((n, k) => {
        if (nodes.indexOf(n) === k) uses.set(n, (uses.get(n) ?? 0) + 1);
      });
    }
  circuit.elements.forEach((el, i) => {
    if (el.type !== 'switch') return;
    for (const end of ['from', 'to'] as const) {
      const node = el[end];
      if (node !== EARTH && (uses.get(node) ?? 0) <= 1) {
        throw new InvalidCircuitError(`switch ${el.id}: node "${node}" is not connected to anything else (check the node name)`, [{ path: `elements[${i}].${end}`, message: `node "${node}" is not used by any other element` }], { elementIds: [el.id], nodes: [node] });
      }
    }
  });
}

/** Validate and expand a circuit without solving it (for the CLI, benchmarks and tools). */
export function prepareCircuit(input: unknown): PreparedCircuit {
  return prepareParsedCircuit(parseCircuit(input));
}

/** `prepareCircuit` of a circuit already validated by `parseCircuit` (sweeps re-validate only the elements they change). */
export function prepareParsedCircuit(circuit: Circuit): PreparedCircuit {
  const context = expandContext(circuit);
  const { expansions, primitives } = expandCircuit(circuit, context);
  checkSwitchNodes(circuit, expansions);
  return { circuit, context, expansions, primitives };
}

/**
 * Results of a prepared circuit from a primitive solution. For live re-solving keep a
 * `createNetwork(prepared.primitives)`, `update` it after an edit and pass its solution here.
 */
export function circuitResults(prepared: PreparedCircuit, solution: PrimitiveSolution, options: Pick<SolveCircuitOptions, 'limits'> = {}): CircuitResult {
  return buildResults(prepared.circuit, prepared.context, prepared.expansions, solution, resolveLimits(prepared.circuit.limits, options.limits));
}

/** Solve a circuit file (unknown input, validated) and return the typed results. Throws the typed errors of errors.ts. */
export function solveCircuit(input: unknown, options: SolveCircuitOptions = {}): CircuitResult {
  const prepared = prepareCircuit(input);
  const limits = resolveLimits(prepared.circuit.limits, options.limits);
  const solution = solvePrimitives(prepared.primitives, options.solver);
  return buildResults(prepared.circuit, prepared.context, prepared.expansions, solution, limits);
}
