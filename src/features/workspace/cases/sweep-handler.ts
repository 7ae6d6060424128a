/**
 * The sweep worker's message handler as a plain function (it runs and is tested outside a Worker
 * too): each point's circuit is the chunk's circuit with the parameters written at their paths,
 * solved by the live-solve handler (which keeps the factor's ordering between points of one
 * topology), and reduced to the outputs asked for. A failing point is reported in its row.
 */
import { lostNeutralEnvelope, sweepCircuit, type CircuitInput } from '../../../../shared/engine/index.ts';
import { circuitNames } from '../../../../shared/review/user-names.ts';
import { createSolveHandler } from '../solve/solve-handler.ts';
import type { PointRow, SweepRequest, SweepResponse } from './sweep-protocol.ts';
import { outputValue } from './sweep-outputs.ts';

export function createSweepHandler(): (req: SweepRequest) => SweepResponse {
  const solve = createSolveHandler();
  let id = 0;
  return (req) => {
    if (req.kind === 'envelope') {
      try {
        return { kind: 'envelope', job: req.job, ok: true, envelope: lostNeutralEnvelope(req.circuit as CircuitInput, req.options) };
      } catch (e) {
        return { kind: 'envelope', job: req.job, ok: false, error: circuitNames(req.circuit).text((e as Error).message) };
      }
    }
    let names: ReturnType<typeof circuitNames> | undefined;
    const words = (m: string) => (names ??= circuitNames(req.circuit)).text(m);
    const rows: PointRow[] = req.points.map((values) => {
      let circuit;
      try {
        circuit = sweepCircuit(req.circuit as CircuitInput, req.paths, values);
      } catch (e) {
        return { outputs: req.outputs.map(() => null), error: words((e as Error).message) };
      }
      const res = solve({ id: ++id, circuit });
      if (!res.ok) return { outputs: req.outputs.map(() => null), error: words(res.error.message) };
      return { outputs: req.outputs.map((o) => outputValue(res.result, o)) };
    });
    return { kind: 'chunk', job: req.job, start: req.start, rows };
  };
}
