/** Entry of a pool worker thread (piscina calls the default export with each task). */
import { runTask, type Task } from './tasks.ts';

export default function work(task: Task) {
  return runTask(task);
}
