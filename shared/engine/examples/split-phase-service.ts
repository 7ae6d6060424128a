/**
 * Demo 2: a 120/240 V split-phase service at Oxley Ford farm: a 25 kVA centre-tapped pole
 * transformer on phase a of a 12.47 kV feeder, a three-wire service drop and unequal legs
 * (1 kW on leg 1, 3 kW on leg 2, a 4.5 kW water heater leg to leg).
 */
import type { CircuitInput } from '../schema/circuit.ts';

export const splitPhaseService: CircuitInput = {
  format: 'wyeward-circuit',
  version: 1,
  frequencyHz: 60,
  name: 'Oxley Ford farm — 120/240 V service',
  description: '25 kVA centre-tapped transformer on phase a of the Oxley Ford 12.47 kV feeder, unequal legs.',
  elements: [
    { type: 'source', id: 'OXF-SUB', bus: 'OXF12', kvLL: 12.47, impedance: { shortCircuitMva: 120, xOverR: 6 } },
    { type: 'splitPhaseTransformer', id: 'POLE-T7', from: 'OXF12', primary: ['a', 'n'], to: 'POLE7', kva: 25, kvHigh: 7.2, lowVolts: 240, percentR: 1.1, percentX: 1.6 },
    {
      type: 'line',
      id: 'SERVICE',
      from: 'POLE7',
      to: 'BARN',
      length: 40,
      lengthUnit: 'm',
      impedance: { kind: 'perConductor', ohmsPerLength: { '1': { re: 0.0005, im: 0.00025 }, '2': { re: 0.0005, im: 0.00025 }, n: { re: 0.0005, im: 0.00025 } } },
    },
    { type: 'load', id: 'LIGHTS', bus: 'BARN', connection: 'single', between: ['1', 'n'], each: { ohms: 14.4 } },
    { type: 'load', id: 'PUMP', bus: 'BARN', connection: 'single', between: ['2', 'n'], each: { ohms: 4.8 } },
    { type: 'load', id: 'WATER-HEATER', bus: 'BARN', connection: 'single', between: ['1', '2'], each: { kw: 4.5, kvar: 0 } },
    { type: 'earthing', id: 'BARN-ROD', node: 'BARN.n', ohms: 20 },
  ],
};
