/** A running balancing's progress in words, for the line beside Cancel. */
import type { BalanceProgress } from '../../../../shared/api/balancing.ts';

const STAGE_WORDS: Record<BalanceProgress['stage'], string> = {
  solving: 'solving the feeder as drawn',
  linearising: 'linearising the feeder',
  milp: 'searching the assignments (HiGHS)',
  'local-search': 'checking moves with exact solves',
  done: 'putting the answer together',
};

/** "Finding the best moves: linearising the feeder — 12 exact solves so far". */
export function progressWords(p: BalanceProgress): string {
  return `Finding the best moves: ${STAGE_WORDS[p.stage] ?? 'working'} — ${p.solves} exact solve${p.solves === 1 ? '' : 's'} so far`;
}
