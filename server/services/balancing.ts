/** Phase balancing of a study: its circuit and a customer list (or its own loads) to the worker pool. */
import { mixWeightsProblem, type BalanceResponse, type MixWeights } from '../../shared/api/balancing.ts';
import type { CircuitInput } from '../../shared/engine/index.ts';
import type { Db } from '../db/index.ts';
import { AppError } from '../errors.ts';
import type { Actor } from '../auth/index.ts';
import { getStudy } from './studies.ts';
import { work } from '../work/index.ts';
import type { BalanceProgressMessage } from '../work/balance-task.ts';

export interface BalanceInput {
  customersCsv?: string;
  objective: 'neutral' | 'unbalance' | 'losses' | 'voltage' | 'mix';
  definition?: 'iec' | 'nema' | 'ieee';
  /** Weights of the weighted mix (checked by balanceRequestSchema). */
  weights?: MixWeights;
  bus?: string;
  maxMoves?: number;
}

/**
 * Balance the latest content of a study of the actor's team (404 otherwise); 400 names what is wrong
 * in the input. `onProgress` hears the job's stage and exact solves while it runs.
 */
export async function balanceStudy(db: Db, actor: Actor, id: string, input: BalanceInput, signal?: AbortSignal, onProgress?: (p: BalanceProgressMessage) => void): Promise<BalanceResponse> {
  const study = await getStudy(db, actor, id);
  if (input.definition && input.objective !== 'unbalance' && input.objective !== 'mix')
    throw new AppError(400, 'validation', 'A definition of unbalance goes with the unbalance objective or the weighted mix.', { fields: { definition: 'only with the unbalance objective or the weighted mix' } });
  if (input.objective === 'mix') {
    const problem = mixWeightsProblem(input.weights);
    if (problem) throw new AppError(400, 'validation', problem, { fields: { weights: problem } });
  } else if (input.weights) throw new AppError(400, 'validation', 'Weights go with the weighted mix objective only.', { fields: { weights: 'only with the weighted mix' } });
  const outcome = await work().balance({ kind: 'balance', circuit: study.content.circuit as unknown as CircuitInput, ...input }, signal, onProgress);
  if (!outcome.ok) throw new AppError(400, 'validation', outcome.message, outcome.field ? { fields: { [outcome.field]: outcome.message } } : {});
  return outcome.response;
}
