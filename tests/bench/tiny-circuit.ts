/**
 * The small benchmark file: ten elements of a 208Y/120 V service (a source, a line, single-phase
 * and delta loads, an earth rod, a capacitor bank and two bare impedances), the kind of file an
 * engineer solves by hand-sized example. Invented data.
 */
import type { CircuitInput } from '../../shared/engine/index.ts';

export const tinyCircuit: CircuitInput = {
  format: 'wyeward-circuit',
  version: 1,
  frequencyHz: 60,
  elements: [
    { type: 'source', id: 'S', bus: 'A', kvLL: 0.208, impedance: { ohms: { re: 0.01, im: 0.04 } } },
    { type: 'line', id: 'L', from: 'A', to: 'B', length: 0.1, impedance: { kind: 'perConductor', ohmsPerLength: { a: { re: 0.3, im: 0.1 }, b: { re: 0.3, im: 0.1 }, c: { re: 0.3, im: 0.1 }, n: { re: 0.3, im: 0.1 } } } },
    { type: 'load', id: 'LA', bus: 'B', connection: 'single', between: ['a', 'n'], each: { kw: 2 } },
    { type: 'load', id: 'LB', bus: 'B', connection: 'single', between: ['b', 'n'], each: { kw: 3, kvar: 1 } },
    { type: 'load', id: 'LC', bus: 'B', connection: 'single', between: ['c', 'n'], each: { ohms: { re: 10, im: 2 } } },
    { type: 'load', id: 'LD', bus: 'B', connection: 'delta', each: { kw: 1 } },
    { type: 'earthing', id: 'E', node: 'B.n', ohms: 25 },
    { type: 'capacitorBank', id: 'C', bus: 'B', kvar: 3 },
    { type: 'impedance', id: 'Z1', from: 'B.a', to: 'B.b', ohms: 100 },
    { type: 'impedance', id: 'Z2', from: 'B.n', to: 'earth', ohms: 50 },
  ],
};
