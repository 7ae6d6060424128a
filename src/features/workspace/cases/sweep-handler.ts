/**
 * The sweep worker's message handler as a plain function (it runs and is tested outside a Worker
 * too): chunks of points solved by the engine's sweep solver (only bus and load results built;
 * the network kept between points of one topology) and answered packed (sweep-store.ts),
 * envelopes by lostNeutralEnvelope. A failing point is reported with its message, naming what the
 * user drew.
 */
import { createSweepSolver, lostNeutralEnvelope, type CircuitInput } from '../../../../shared/engine/index.ts';
import { circuitNames } from '../../../../shared/review/user-names.ts';
import type { SweepRequest, SweepResponse } from './sweep-protocol.ts';
import { packRows } from './sweep-store.ts';

export function createSweepHandler(): (req: SweepRequest) => SweepResponse {
  const solve = createSweepSolver();
  return (req) => {
    const names = () => circuitNames(req.circuit);
    if (req.kind === 'envelope') {
      try {
        return { kind: 'envelope', job: req.job, ok: true, envelope: lostNeutralEnvelope(req.circuit as CircuitInput, req.options) };
      } catch (e) {
        return { kind: 'envelope', job: req.job, ok: false, error: names().text((e as Error).message) };
      }
    }
    let rows;
    try {
      rows = solve(req.circuit as CircuitInput, req.paths, req.points, req.outputs);
    } catch (e) {
      const error = (e as Error).message;
      rows = req.points.map(() => ({ outputs: req.outputs.map(() => null), error }));
    }
    if (rows.some((r) => r.error)) {
      const n = names();
      rows = rows.map((r) => (r.error ? { ...r, error: n.text(r.error) } : r));
    }
    return { kind: 'chunk', job: req.job, start: req.start, rows: packRows(rows, req.outputs.length) };
  };
}
