/**
 * The sweep worker's message handler as a plain function (it runs and is tested outside a Worker
 * too): chunks of points solved by the engine's sweep solver (only the recorded loads' and buses'
 * results built; the circuit validated and expanded once per sweep, from the setup its first chunk
 * brings; the network kept between points of one topology) and answered packed (sweep-store.ts),
 * envelopes by lostNeutralEnvelope. A failing point is reported with its message, naming what the
 * user drew.
 */
import { createSweepSolver, lostNeutralEnvelope, type CircuitInput } from '../../../../shared/engine/index.ts';
import { circuitNames } from '../../../../shared/review/user-names.ts';
import type { SweepRequest, SweepResponse, SweepSetup } from './sweep-protocol.ts';
import { packRows } from './sweep-store.ts';

export function createSweepHandler(): (req: SweepRequest) => SweepResponse {
  const solve = createSweepSolver();
  /** The sweep this worker is on: its setup, kept from its first chunk for the later ones. */
  let current: { job: number; setup: SweepSetup } | null = null;
  return (req) => {
    if (req.kind === 'envelope') {
      try {
        return { kind: 'envelope', job: req.job, ok: true, envelope: lostNeutralEnvelope(req.circuit as CircuitInput, req.options) };
      } catch (e) {
        return { kind: 'envelope', job: req.job, ok: false, error: circuitNames(req.circuit).text((e as Error).message) };
      }
    }
    if (req.setup) current = { job: req.job, setup: req.setup };
    if (!current || current.job !== req.job) {
      // a chunk of a sweep whose setup this worker never had (not sent by the pool): every point says so
      const error = 'the sweep worker lost the circuit of this sweep; run the sweep again';
      return { kind: 'chunk', job: req.job, start: req.start, rows: packRows(req.points.map(() => ({ outputs: [], error })), 0) };
    }
    const { circuit, paths, outputs } = current.setup;
    let rows;
    try {
      rows = solve(circuit as CircuitInput, paths, req.points, outputs);
    } catch (e) {
      const error = (e as Error).message;
      rows = req.points.map(() => ({ outputs: outputs.map(() => null), error }));
    }
    if (rows.some((r) => r.error)) {
      const n = circuitNames(circuit);
      rows = rows.map((r) => (r.error ? { ...r, error: n.text(r.error) } : r));
    }
    return { kind: 'chunk', job: req.job, start: req.start, rows: packRows(rows, outputs.length) };
  };
}
