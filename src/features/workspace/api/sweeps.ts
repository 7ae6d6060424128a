/**
 * Server sweep jobs (`/api/studies/:id/sweeps`): start, read progress and points, cancel. Plain
 * fetchers: the sweep panel polls a running job itself (no cache to share between screens).
 */
import type { CreateSweepRequest, SweepJob } from '../../../../shared/api/sweeps.ts';
import { api } from '../../../lib/api-client.ts';

const sweepsPath = (studyId: string) => `/api/studies/${encodeURIComponent(studyId)}/sweeps`;

/** POST /api/studies/:id/sweeps → 202 with the job's first state. */
export function startServerSweep(studyId: string, body: CreateSweepRequest): Promise<SweepJob> {
  return api.post<SweepJob>(sweepsPath(studyId), body);
}

/** GET /api/studies/:id/sweeps/:job: progress, and the solved points from `offset` (at most `limit`). */
export function getServerSweep(studyId: string, job: string, offset: number, limit = 10_000, signal?: AbortSignal): Promise<SweepJob> {
  return api.get<SweepJob>(`${sweepsPath(studyId)}/${encodeURIComponent(job)}?offset=${offset}&limit=${limit}`, { signal });
}

/** DELETE /api/studies/:id/sweeps/:job: cancels a running job. */
export function cancelServerSweep(studyId: string, job: string): Promise<SweepJob> {
  return api.delete<SweepJob>(`${sweepsPath(studyId)}/${encodeURIComponent(job)}`);
}
