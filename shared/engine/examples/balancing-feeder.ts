/**
 * Demo for phase balancing: Wrenfold Close, an invented 230/400 V, 50 Hz residential feeder. The
 * LV board of the estate's distribution transformer (as a source behind its impedance) feeds a
 * main four-core cable past seven pillars (WC1–WC7), a spur of smaller cable (SP1, SP2) and a
 * two-phase spur (LN1: phases A and B and the neutral only). Thirty-six houses, connected A, B, C
 * when the estate was built, have drifted: heat pumps and car chargers went mostly onto phase A.
 * Cable data are round invented values of the order of 95 mm² and 35 mm² aluminium cable (P).
 */
import type { CircuitInput } from '../schema/circuit.ts';
import { parseCustomersCsv } from '../balancing/customers.ts';
import { customerLoad } from '../balancing/feeder.ts';

const MAIN = { kind: 'sequence' as const, z1PerLength: { re: 0.32, im: 0.075 }, z0PerLength: { re: 1.28, im: 0.3 }, neutralOhmsPerLength: { re: 0.32, im: 0.08 } };
const SPUR = { kind: 'sequence' as const, z1PerLength: { re: 0.87, im: 0.08 }, z0PerLength: { re: 3.5, im: 0.32 }, neutralOhmsPerLength: { re: 0.87, im: 0.09 } };
const TWO_PHASE = { kind: 'perConductor' as const, ohmsPerLength: { a: { re: 0.87, im: 0.09 }, b: { re: 0.87, im: 0.09 }, n: { re: 0.87, im: 0.09 } } };

const cable = (id: string, from: string, to: string, metres: number, impedance: typeof MAIN | typeof SPUR | typeof TWO_PHASE) => ({
  type: 'line' as const,
  id,
  from,
  to,
  length: metres,
  lengthUnit: 'm' as const,
  perLengthUnit: 'km' as const,
  impedance,
});

export const balancingFeeder: CircuitInput = {
  format: 'wyeward-circuit',
  version: 1,
  frequencyHz: 50,
  name: 'Wrenfold Close LV feeder',
  description: '230/400 V residential feeder: seven pillars on the main cable, a spur and a two-phase spur; the houses are in the customer list.',
  elements: [
    { type: 'source', id: 'WC-BOARD', bus: 'WC0', kvLL: 0.4, impedance: { z1: { re: 0.004, im: 0.016 }, z0: { re: 0.004, im: 0.016 } } },
    cable('WC-01', 'WC0', 'WC1', 60, MAIN),
    cable('WC-12', 'WC1', 'WC2', 45, MAIN),
    cable('WC-23', 'WC2', 'WC3', 45, MAIN),
    cable('WC-34', 'WC3', 'WC4', 50, MAIN),
    cable('WC-45', 'WC4', 'WC5', 50, MAIN),
    cable('WC-56', 'WC5', 'WC6', 40, MAIN),
    cable('WC-67', 'WC6', 'WC7', 40, MAIN),
    cable('SP-31', 'WC3', 'SP1', 35, SPUR),
    cable('SP-12', 'SP1', 'SP2', 35, SPUR),
    cable('LN-51', 'WC5', 'LN1', 50, TWO_PHASE),
    { type: 'earthing', id: 'WC7-ROD', node: 'WC7.n', ohms: 20 },
  ],
};

/** The houses of Wrenfold Close at the evening peak (kW after diversity), as the customer CSV. */
export const balancingCustomersCsv = `customer,bus,phase,kw,pf,fixed
No 1,WC1,A,1.3,0.97,
No 2,WC1,B,0.6,0.98,
No 3,WC1,C,0.5,0.98,
No 4,WC1,A,2.0,0.95,
No 5,WC2,A,2.6,0.96,
No 6,WC2,B,0.7,0.98,
No 7,WC2,C,0.6,0.98,
No 8,WC2,A,1.2,0.97,
No 9,WC3,A,3.9,0.99,
No 10,WC3,B,0.9,0.97,
No 11,WC3,A,1.0,0.97,yes
No 12,WC4,A,1.7,0.95,
No 13,WC4,B,0.4,0.98,
No 14,WC4,C,0.7,0.98,
No 15,WC4,A,2.4,0.96,
No 16,WC5,A,1.5,0.97,
No 17,WC5,B,0.8,0.98,
No 18,WC5,C,0.4,0.98,
No 19,WC6,A,3.9,0.99,
No 20,WC6,B,1.1,0.97,
No 21,WC6,C,0.6,0.98,
No 22,WC6,A,1.8,0.95,
No 23,WC7,A,2.5,0.96,
No 24,WC7,B,0.7,0.98,
No 25,WC7,C,0.5,0.98,
No 26,WC7,A,1.4,0.97,
No 27,SP1,A,2.1,0.96,
No 28,SP1,B,0.6,0.98,
No 29,SP1,C,0.8,0.97,yes
No 30,SP2,A,1.6,0.96,
No 31,SP2,B,0.5,0.98,
No 32,SP2,A,2.9,0.99,
No 33,LN1,A,1.9,0.96,
No 34,LN1,B,0.4,0.98,
No 35,LN1,A,1.4,0.97,
No 36,LN1,A,0.9,0.97,
`;

/**
 * The feeder with the houses drawn as single-phase loads on their present phases: the demo study
 * seeded for every team, so the balancing page can run on it at once.
 */
export const balancingStudy: CircuitInput = {
  ...balancingFeeder,
  name: 'Wrenfold Close LV feeder with its houses',
  elements: [...balancingFeeder.elements, ...parseCustomersCsv(balancingCustomersCsv).map((c) => customerLoad(c, c.phase))],
};
