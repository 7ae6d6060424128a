/**
 * Messages between the page and the sweep workers (structured-clone safe: plain data only). A
 * chunk's answer is packed in one Float64Array, transferred, not copied: no object per point.
 */
import type { PackedRows } from './sweep-store.ts';
import type { EnvelopeOptions, LostNeutralEnvelope } from '../../../../shared/engine/index.ts';
import type { OutputSpec } from '../../../../shared/review/sweep-outputs.ts';

/** What stays the same for every chunk of one sweep: the circuit (a case already applied), the parameter paths, the outputs. */
export interface SweepSetup {
  circuit: unknown;
  paths: string[];
  outputs: OutputSpec[];
}

/**
 * A chunk of sweep points (values per path) from `start`. The first chunk of a sweep a worker gets
 * carries the sweep's `setup`; the worker keeps it (and the circuit validated and expanded from it)
 * for the later chunks of the same job, which carry only their points.
 */
export interface SweepChunk {
  kind: 'chunk';
  job: number;
  start: number;
  points: number[][];
  setup?: SweepSetup;
}

/** One solved point: the outputs in request order, or why the point could not be solved. */
export interface PointRow {
  outputs: (number | null)[];
  error?: string;
}

export interface EnvelopeRequest {
  kind: 'envelope';
  job: number;
  circuit: unknown;
  options: EnvelopeOptions;
}

export type SweepRequest = SweepChunk | EnvelopeRequest;

export type SweepResponse =
  | { kind: 'chunk'; job: number; start: number; rows: PackedRows }
  | { kind: 'envelope'; job: number; ok: true; envelope: LostNeutralEnvelope }
  | { kind: 'envelope'; job: number; ok: false; error: string };
