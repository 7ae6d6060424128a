/** Entry of a pool worker thread (piscina calls the default export with each task). */
import { runTask, type Task } from './tasks.ts';
import { runBalance, type BalanceTask } from './balance-task.ts';
import { readStudyFile, type ImportTask } from './import-file.ts';
import { renderReportPdf } from '../report/pdf.ts';

export default function work(task: Task | BalanceTask | ImportTask) {
  if (task.kind === 'balance') return runBalance(task);
  if (task.kind === 'import') return readStudyFile(task.body);
  if (task.kind === 'report') return renderReportPdf(task.input);
  return runTask(task);
}
