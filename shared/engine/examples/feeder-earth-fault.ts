/**
 * Demo 4: a small four-wire 12.47 kV feeder out of the invented Kestrel Cross substation, two
 * overhead sections with conductor data (modified Carson equations), the neutral earthed at the
 * far end, loads along the way and a bolted phase-a-to-earth fault at the end of the feeder.
 * The pole-top geometry and conductor data are those of the textbook configuration in Kersting,
 * *Distribution System Modeling and Analysis*, ch. 4 (336,400 26/7 ACSR phases, 4/0 6/1 ACSR neutral);
 * the feeder, loads and source strength are invented.
 */
import type { CircuitInput } from '../schema/circuit.ts';

const geometry = {
  kind: 'carson' as const,
  earthResistivityOhmM: 100,
  conductors: [
    { conductor: 'a' as const, xFt: 0, yFt: 29, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
    { conductor: 'b' as const, xFt: 2.5, yFt: 29, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
    { conductor: 'c' as const, xFt: 7, yFt: 29, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
    { conductor: 'n' as const, xFt: 4, yFt: 25, gmrFt: 0.00814, rOhmsPerMile: 0.592 },
  ],
};

export const feederEarthFault: CircuitInput = {
  format: 'wyeward-circuit',
  version: 1,
  frequencyHz: 60,
  name: 'Kestrel Cross feeder 3 — phase-a earth fault',
  description: '12.47 kV four-wire feeder, two Carson-modelled sections, loads, bolted a-earth fault at the feeder end.',
  elements: [
    { type: 'source', id: 'KX-SUB', bus: 'KX', kvLL: 12.47, impedance: { z1: { re: 0.3, im: 2.4 }, z0: { re: 0.2, im: 1.6 } } },
    { type: 'line', id: 'KX-SEC1', from: 'KX', to: 'MILL', length: 1.2, lengthUnit: 'mi', impedance: geometry },
    { type: 'line', id: 'KX-SEC2', from: 'MILL', to: 'END', length: 0.8, lengthUnit: 'mi', impedance: geometry },
    { type: 'load', id: 'MILL-LOAD', bus: 'MILL', connection: 'wye', phases: { a: { kw: 400, kvar: 150 }, b: { kw: 300, kvar: 120 }, c: { kw: 350, kvar: 100 } } },
    { type: 'load', id: 'END-LOAD', bus: 'END', connection: 'wye', total: { kw: 600, kvar: 250 } },
    { type: 'earthing', id: 'END-GND', node: 'END.n', ohms: 5 },
    { type: 'fault', id: 'F1', bus: 'END', kind: 'lineEarth', phases: ['a'] },
  ],
};
