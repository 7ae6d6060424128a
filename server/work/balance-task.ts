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
import type { BalanceProgress, BalanceResponse, MixWeights } from '../../shared/api/balancing.ts';
import { circuitNames } from '../../shared/review/user-names.ts';
import type { MessagePort } from 'node:worker_threads';
import { highsRuntime } from './highs.ts';

/** What a running balancing job reports: its stage and the exact solves made so far. */
export type BalanceProgressMessage = BalanceProgress;

/** At most one progress message per this many milliseconds (a new stage is always sent). */
const PROGRESS_EVERY_MS = 100;

export interface BalanceTask {
  kind: 'balance';
  circuit: CircuitInput;
  customersCsv?: string;
  objective: 'neutral' | 'unbalance' | 'losses' | 'voltage' | 'mix';
  definition?: 'iec' | 'nema' | 'ieee';
  weights?: MixWeights;
  bus?: string;
  maxMoves?: number;
  /** Where progress goes (a transferred MessagePort of a MessageChannel); absent: none is sent. */
  progress?: MessagePort;
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
    if (e instanceof CustomerListError) {
      const problems = `${e.issues.slice(0, 5).map(issueText).join('; ')}${e.issues.length > 5 ? `; and ${e.issues.length - 5} more` : ''}.`;
      // without a list, the customers are the study's own loads: no list to blame
      if (task.customersCsv === undefined) return { ok: false, message: `The study's loads cannot be balanced: ${words(problems)}` };
      return { ok: false, message: `The customer list has problems: ${problems}`, field: 'customersCsv' };
    }
    throw e;
  }
  const highs = await highsRuntime();
  let lastStage = '';
  let lastAt = 0;
  const onProgress = task.progress
    ? (p: BalanceProgressMessage) => {
        const now = Date.now();
        if (p.stage === lastStage && now - lastAt < PROGRESS_EVERY_MS) return;
        lastStage = p.stage;
        lastAt = now;
        task.progress?.postMessage({ stage: p.stage, solves: p.solves } satisfies BalanceProgressMessage);
      }
    : undefined;
  try {
    const r = balancePhases(highs, feeder, customers, {
      objective: { objective: task.objective, ...(task.definition ? { definition: task.definition } : {}), ...(task.objective === 'mix' && task.weights ? { weights: task.weights } : {}) },
      bus: task.bus,
      maxMoves: task.maxMoves,
      milpTimeLimitS: 3,
      relinearise: 2,
      maxEvaluations: 150,
      onProgress,
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
    if (e instanceof CustomerListError) {
      const problems = e.issues.slice(0, 5).map(issueText).join('; ');
      // problems of rows are the customers'; others (the bus asked for) the settings'
      if (e.issues.some((i) => i.row !== undefined)) return { ok: false, message: `The customers do not fit the study: ${problems}.`, field: 'customersCsv' };
      return { ok: false, message: `The study cannot be balanced: ${words(problems)}.`, ...(task.bus !== undefined && problems.includes(`bus "${task.bus}"`) ? { field: 'bus' } : {}) };
    }
    if (e instanceof EngineError) return { ok: false, message: `The study cannot be balanced: ${words(e.message)}` };
    throw e;
  } finally {
    task.progress?.close();
  }
}
