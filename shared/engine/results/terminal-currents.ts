/** Currents of a primitive at each of its terminals, flowing from the node into the element. */
import type { Cx, Primitive } from '../types.ts';
import { neg } from '../phasor.ts';

/** [node, current into the element at that node] for every terminal of `p`, given the solver's currents. */
export function terminalCurrents(p: Primitive, currents: readonly Cx[]): [string, Cx][] {
  switch (p.type) {
    case 'impedance':
    case 'switch':
    case 'zipLoad':
    case 'currentSource':
      return [
        [p.from, currents[0]],
        [p.to, neg(currents[0])],
      ];
    case 'voltageSource':
      // The solver's current leaves `plus` into the circuit.
      return [
        [p.plus, neg(currents[0])],
        [p.minus, currents[0]],
      ];
    case 'coupledBranch':
      return p.from.flatMap((f, k): [string, Cx][] => [
        [f, currents[k]],
        [p.to[k], neg(currents[k])],
      ]);
    case 'admittanceMatrix':
      return p.nodes.map((n, k): [string, Cx] => [n, currents[k]]);
  }
}

/** Every node a primitive touches. */
export function primitiveNodes(p: Primitive): string[] {
  switch (p.type) {
    case 'voltageSource':
      return [p.plus, p.minus];
    case 'coupledBranch':
      return [...p.from, ...p.to];
    case 'admittanceMatrix':
      return [...p.nodes];
    default:
      return [p.from, p.to];
  }
}
