/**
 * Demo 3: the Pellham Moor business park, fed from a 12.47 kV feeder through a 300 kVA delta /
 * 208Y/120 V bank (North American connection D-Yg: low side lags by 30°), with unequal wye loads
 * so the delta-side line currents, the 30° shift and the LV neutral current can be examined.
 */
import type { CircuitInput } from '../schema/circuit.ts';

export const deltaWyeBank: CircuitInput = {
  format: 'wyeward-circuit',
  version: 1,
  frequencyHz: 60,
  name: 'Pellham Moor business park — delta/wye bank',
  description: '12.47 kV feeder, 300 kVA D-Yg 12.47 kV / 208Y/120 V bank, unequal wye loads on the 208 V bus.',
  elements: [
    { type: 'source', id: 'PM-SUB', bus: 'PM12', kvLL: 12.47, impedance: { shortCircuitMva: 150, xOverR: 8, z0OverZ1: 1.5 } },
    {
      type: 'line',
      id: 'PM-TAP',
      from: 'PM12',
      to: 'PMT',
      length: 0.8,
      lengthUnit: 'km',
      impedance: { kind: 'sequence', z1PerLength: { re: 0.19, im: 0.38 }, z0PerLength: { re: 0.48, im: 1.25 } },
    },
    { type: 'transformer', id: 'PM-BANK', from: 'PMT', to: 'PM208', kva: 300, kvHigh: 12.47, kvLow: 0.208, connection: 'D-Yg', percentZ: 5, xOverR: 4 },
    { type: 'load', id: 'OFFICES', bus: 'PM208', connection: 'wye', phases: { a: { kw: 60, kvar: 20 }, b: { kw: 35, kvar: 10 }, c: { kw: 20, kvar: 5 } } },
    { type: 'load', id: 'WORKSHOP', bus: 'PM208', connection: 'delta', total: { kw: 45, kvar: 25 } },
  ],
};
