/** The server's one work pool (configured by createApp from WORK_THREADS / WORK_TIMEOUT_MS), used by the services. */
import { createWorkPool, type WorkPool, type WorkPoolOptions } from './pool.ts';

let current: WorkPool = createWorkPool();

/** The work pool services hand heavy jobs to. */
export function work(): WorkPool {
  return current;
}

/** Replaces the pool with one of these options (the old one is closed). */
export function configureWork(options: WorkPoolOptions): void {
  const old = current;
  current = createWorkPool(options);
  void old.close();
}

/** Stops the pool's threads (on shutdown). */
export function closeWork(): Promise<void> {
  return current.close();
}
