/**
 * Sweep points: one or two parameters, each from `from` to `to` in `steps` points (both ends
 * included), spaced linearly or logarithmically; two parameters give every combination, the first
 * parameter varying slowest. Pure: the CLI and the browser use the same generator.
 */
import { InvalidCircuitError } from '../errors.ts';
import type { CircuitInput } from '../schema/circuit.ts';
import { setPath } from './set-path.ts';

/** One swept parameter: its path (see set-path.ts) and range. `steps` is the number of points. */
export interface SweepParameter {
  path: string;
  from: number;
  to: number;
  steps: number;
  scale?: 'linear' | 'log';
}

/** Largest number of points one sweep may have (guards against a typo such as 1:10:100000 twice). */
export const MAX_SWEEP_POINTS = 1_000_000;

function bad(message: string): never {
  throw new InvalidCircuitError(message, [{ path: 'sweep', message }]);
}

/** The values of one parameter: `steps` points from `from` to `to` (both exact), linear or log-spaced. */
export function sweepValues(p: Omit<SweepParameter, 'path'>): number[] {
  const { from, to, steps } = p;
  const scale = p.scale ?? 'linear';
  if (!Number.isFinite(from) || !Number.isFinite(to)) bad('a sweep range needs finite from and to values');
  if (!Number.isInteger(steps) || steps < 1) bad(`a sweep needs a whole number of points ≥ 1 (got ${steps})`);
  if (steps === 1) return [from];
  if (scale === 'log' && !(from > 0 && to > 0)) bad('a logarithmic sweep needs from and to both above 0');
  const out: number[] = [];
  for (let k = 0; k < steps; k++) {
    const t = k / (steps - 1);
    out.push(k === steps - 1 ? to : scale === 'log' ? from * Math.pow(to / from, t) : from + (to - from) * t);
  }
  return out;
}

/** Every point of a sweep over 1 or 2 parameters: one array of values (in parameter order) per point. */
export function sweepPoints(params: readonly Omit<SweepParameter, 'path'>[]): number[][] {
  if (params.length < 1 || params.length > 2) bad(`a sweep varies one or two parameters (got ${params.length})`);
  const lists = params.map(sweepValues);
  const total = lists.reduce((n, l) => n * l.length, 1);
  if (total > MAX_SWEEP_POINTS) bad(`a sweep of ${total} points is more than ${MAX_SWEEP_POINTS}; use fewer steps`);
  if (lists.length === 1) return lists[0].map((v) => [v]);
  const out: number[][] = [];
  for (const a of lists[0]) for (const b of lists[1]) out.push([a, b]);
  return out;
}

/** The circuit of one sweep point: each parameter's value written at its path. Pure. */
export function sweepCircuit(circuit: CircuitInput | Record<string, unknown>, paths: readonly string[], values: readonly number[]): CircuitInput {
  let c = circuit as CircuitInput;
  paths.forEach((p, i) => {
    c = setPath(c, p, values[i]);
  });
  return c;
}
