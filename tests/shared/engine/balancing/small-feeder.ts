/**
 * An invented 230/400 V, 50 Hz four-wire feeder of three sections for the balancing tests, and a
 * list of customers crowded onto phase A. Conductor data are round invented values of the order of
 * a 95 mm² aluminium underground cable (P).
 */
import type { CircuitInput, Customer } from '../../../../shared/engine/index.ts';

const section = (id: string, from: string, to: string, metres: number) => ({
  type: 'line' as const,
  id,
  from,
  to,
  length: metres,
  lengthUnit: 'm' as const,
  perLengthUnit: 'km' as const,
  impedance: { kind: 'sequence' as const, z1PerLength: { re: 0.32, im: 0.075 }, z0PerLength: { re: 1.3, im: 0.3 }, neutralOhmsPerLength: { re: 0.32, im: 0.08 } },
});

export const smallFeeder: CircuitInput = {
  format: 'wyeward-circuit',
  version: 1,
  frequencyHz: 50,
  name: 'Test lane feeder',
  elements: [
    { type: 'source', id: 'BOARD', bus: 'S', kvLL: 0.4, impedance: { z1: { re: 0.01, im: 0.03 }, z0: { re: 0.01, im: 0.03 } } },
    section('S-1', 'S', 'P1', 120),
    section('1-2', 'P1', 'P2', 100),
    section('2-3', 'P2', 'P3', 80),
  ],
};

const c = (customer: string, bus: string, phase: 'A' | 'B' | 'C', kw: number, kvar: number, extra: Partial<Customer> = {}): Customer => ({
  customer,
  bus,
  phase,
  kw,
  kvar,
  fixed: false,
  model: 'p',
  allowed: ['A', 'B', 'C'],
  ...extra,
});

/** Seven customers, most on phase A, one fixed, one limited to A or B. */
export const smallCustomers: Customer[] = [
  c('H1', 'P1', 'A', 4.2, 1.0),
  c('H2', 'P1', 'A', 2.5, 0.6),
  c('H3', 'P2', 'A', 6.0, 1.5),
  c('H4', 'P2', 'B', 1.2, 0.3, { fixed: true }),
  c('H5', 'P3', 'A', 3.4, 0.9),
  c('H6', 'P3', 'A', 5.1, 1.2, { allowed: ['A', 'B'] }),
  c('H7', 'P3', 'C', 0.8, 0.2),
];
