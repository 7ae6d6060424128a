/**
 * The balancing job of the work pool (a worker thread: HiGHS and many exact solves take seconds):
 * a study's circuit and either a customer CSV or the study's own single-phase loads in, the
 * answer of POST /api/studies/:id/balance out, or the user's mistake in words. Plain data both ways.
 */
import {
  CustomerListError,
  EngineError,
  MOVES_CAUTION,
  balancePhases,
  customersFromCircuit,
  issueText,
  objectiveWords,
  parseCustomersCsv,
  type CircuitInput,
  type Customer,
} from '../../shared/engine/index.ts';
import type { BalanceResponse, MixWeights } from '../../shared/api/balancing.ts';
import { circuitNames } from '../../shared/review/user-names.ts';
import { highsRuntime } from './highs.ts';

export interface BalanceTask {
  kind: 'balance';
  circuit: CircuitInput;
  customersCsv?: string;
  objective: 'neutral' | 'unbalance' | 'losses' | 'voltage' | 'mix';
  definition?: 'iec' | 'nema' | 'ieee';
  weights?: MixWeights;
  bus?: string;
  maxMoves?: number;
}

export type BalanceOutcome = { ok: true; response: BalanceResponse } | { ok: false; message: string; field?: string };

/** Run one balancing job (see the file header). */
export async function runBalance(task: BalanceTask): Promise<BalanceOutcome> {
  const words = (m: string) => circuitNames(task.circuit).text(m);
  let feeder: CircuitInput;
  let customers: Customer[];
  try {
    if (task.customersCsv !== undefined) {
      feeder = task.circuit;
      customers = parseCustomersCsv(task.customersCsv);
    } else ({ feeder, customers } = customersFromCircuit(task.circuit));
  } catch (e) {
    if (e instanceof CustomerListError) return { ok: false, message: `The customer list has problems: ${e.issues.slice(0, 5).map(issueText).join('; ')}${e.issues.length > 5 ? `; and ${e.issues.length - 5} more` : ''}.`, field: 'customersCsv' };
    throw e;
  }
  const highs = await highsRuntime();
  try {
    const r = balancePhases(highs, feeder, customers, {
      objective: { objective: task.objective, ...(task.definition ? { definition: task.definition } : {}), ...(task.objective === 'mix' && task.weights ? { weights: task.weights } : {}) },
      bus: task.bus,
      maxMoves: task.maxMoves,
      milpTimeLimitS: 3,
      relinearise: 2,
      maxEvaluations: 150,
    });
    return {
      ok: true,
      response: {
        objective: objectiveWords(r),
        assignment: r.assignment,
        moves: r.moves,
        before: r.before,
        after: r.after,
        rotatingRule: r.rotatingRule,
        gapPercent: Number.isFinite(r.gapPercent) ? r.gapPercent : null,
        milpStatus: r.milp.status,
        solves: r.solves,
        maxMoves: r.maxMoves,
        voltages: { before: r.voltages.before, after: r.voltages.after },
        currents: { at: r.neutralMeasuredAt.direction === 'out' ? `leaving bus ${r.neutralMeasuredAt.bus}` : `arriving at bus ${r.neutralMeasuredAt.bus}`, before: r.currents.before, after: r.currents.after },
        fromStudy: task.customersCsv === undefined,
        caution: MOVES_CAUTION,
      },
    };
  } catch (e) {
    if (e instanceof CustomerListError) return { ok: false, message: `The customers do not fit the study: ${e.issues.slice(0, 5).map(issueText).join('; ')}.`, field: e.issues.some((i) => i.row !== undefined) ? 'customersCsv' : undefined };
    if (e instanceof EngineError) return { ok: false, message: `The study cannot be balanced: ${words(e.message)}` };
    throw e;
  }
}
