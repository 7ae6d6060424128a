/** Entry of a pool worker thread (piscina calls the default export with each task). */
import { runTask, type Task } from './tasks.ts';
import { runBalance, type BalanceTask } from './balance-task.ts';

export default function work(task: Task | BalanceTask) {
  if (task.kind === 'balance') return runBalance(task);
  return runTask(task);
}
