/**
 * Messages between the page and the sweep workers (structured-clone safe: plain data only). A
 * chunk's answer is packed in one Float64Array, transferred, not copied: no object per point.
 */
import type { PackedRows } from './sweep-store.ts';
import type { EnvelopeOptions, LostNeutralEnvelope } from '../../../../shared/engine/index.ts';
import type { OutputSpec } from '../../../../shared/review/sweep-outputs.ts';

/** A chunk of sweep points: the circuit (a case already applied), the parameter paths, the points (values per path) from `start`. */
export interface SweepChunk {
  kind: 'chunk';
  job: number;
  start: number;
  circuit: unknown;
  paths: string[];
  points: number[][];
  outputs: OutputSpec[];
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
