/**
 * `/api/health`: is this instance able to serve? Each dependency has a probe (the database by
 * default; the object store adds its own through `AppDeps.healthChecks`), run at once with a time
 * limit. All answer → 200; any fails or is too slow → 503, naming which, so a load balancer takes
 * the instance out. `/api/health/live` answers without touching any dependency (is the process up).
 */
import { Router } from 'express';

/** A probe resolves when its dependency answers and rejects (or hangs) when it does not. */
export type HealthCheck = () => Promise<void>;

/** Longest a probe may take before it counts as failed. */
export const HEALTH_TIMEOUT_MS = 3000;

export interface CheckResult {
  ok: boolean;
  /** Milliseconds the probe took (or the limit, when it did not answer in time). */
  ms: number;
  /** What went wrong, in a few words (never a connection string or an error message that might quote one). */
  error?: 'unreachable' | 'timeout';
}

async function probe(check: HealthCheck, timeoutMs: number): Promise<CheckResult> {
  const t0 = performance.now();
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<'timeout'>((resolve) => {
    timer = setTimeout(() => resolve('timeout'), timeoutMs);
  });
  try {
    const outcome = await Promise.race([check().then(() => 'ok' as const), timeout]);
    const ms = Math.round(performance.now() - t0);
    return outcome === 'ok' ? { ok: true, ms } : { ok: false, ms, error: 'timeout' };
  } catch {
    return { ok: false, ms: Math.round(performance.now() - t0), error: 'unreachable' };
  } finally {
    clearTimeout(timer);
  }
}

/** The health routes over named probes (`database`, and whatever else is registered). */
export function healthRoutes(checks: Record<string, HealthCheck>, timeoutMs = HEALTH_TIMEOUT_MS): Router {
  const router = Router();
  router.get('/', async (_req, res) => {
    const names = Object.keys(checks);
    const results = await Promise.all(names.map((n) => probe(checks[n], timeoutMs)));
    const body: Record<string, CheckResult> = {};
    names.forEach((n, i) => (body[n] = results[i]));
    const ok = results.every((r) => r.ok);
    res.status(ok ? 200 : 503).json({ ok, ...body });
  });
  router.get('/live', (_req, res) => {
    res.json({ ok: true });
  });
  return router;
}
