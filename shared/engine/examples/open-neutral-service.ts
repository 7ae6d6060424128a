/**
 * Demo 1: a 208Y/120 V service in the invented town of Brackenfield with unequal single-phase
 * loads and the service neutral broken (`open: ["n"]` on the service drop). The customer's
 * neutral is held only by its earth rod, so the star point floats towards the heavy phase's
 * opposite: the lightly loaded phase sees far more than 120 V.
 */
import type { CircuitInput } from '../schema/circuit.ts';

export const openNeutralService: CircuitInput = {
  format: 'wyeward-circuit',
  version: 1,
  frequencyHz: 60,
  name: 'Brackenfield Lane 14 — open service neutral',
  description: '208Y/120 V pad-mount secondary, 30 m service drop with a broken neutral, unequal 120 V loads on the three phases.',
  elements: [
    { type: 'source', id: 'XFMR-SEC', bus: 'PAD', kvLL: 0.208, impedance: { ohms: { re: 0.004, im: 0.012 } } },
    {
      type: 'line',
      id: 'DROP',
      from: 'PAD',
      to: 'HOUSE',
      length: 30,
      lengthUnit: 'm',
      impedance: { kind: 'perConductor', ohmsPerLength: { a: { re: 0.00054, im: 0.0003 }, b: { re: 0.00054, im: 0.0003 }, c: { re: 0.00054, im: 0.0003 }, n: { re: 0.00054, im: 0.0003 } } },
      open: ['n'],
    },
    { type: 'load', id: 'KITCHEN', bus: 'HOUSE', connection: 'single', between: ['a', 'n'], each: { kw: 1.5, kvar: 0.2 } },
    { type: 'load', id: 'HEATER', bus: 'HOUSE', connection: 'single', between: ['b', 'n'], each: { kw: 4, kvar: 0 } },
    { type: 'load', id: 'ELECTRONICS', bus: 'HOUSE', connection: 'single', between: ['c', 'n'], each: { kw: 0.6, kvar: 0.1 } },
    { type: 'earthing', id: 'ROD', node: 'HOUSE.n', ohms: 25 },
  ],
};
