/**
 * POST /api/studies/:id/balance: phase balancing of a study (any team member; it writes nothing).
 * Answers JSON; a client whose Accept asks for `application/x-ndjson` gets newline-delimited JSON
 * instead: `{"progress":{"stage","solves"}}` lines while the job runs, then `{"result":…}` (the JSON
 * answer's body) or `{"error":{"code","message"}}` if it fails after streaming began. Errors found
 * before the first progress line (bad input, unknown study) are ordinary 4xx JSON answers.
 */
import { Router, type Response } from 'express';
import { BALANCE_STREAM_TYPE as NDJSON, balanceRequestSchema } from '../../shared/api/balancing.ts';
import { actorOf, requireUser } from '../auth/index.ts';
import { AppError } from '../errors.ts';
import { balanceStudy } from '../services/balancing.ts';
import type { BalanceProgressMessage } from '../work/balance-task.ts';
import { param, type RouteContext } from './context.ts';

export function balancingRoutes({ db }: RouteContext): Router {
  const r = Router();
  r.post('/:id/balance', requireUser, async (req, res) => {
    const input = balanceRequestSchema.parse(req.body);
    // a client that goes away (the Cancel button aborts its request) stops the job
    const cancel = new AbortController();
    res.on('close', () => {
      if (!res.writableFinished) cancel.abort();
    });
    if (!(req.get('accept') ?? '').includes(NDJSON)) {
      res.json(await balanceStudy(db, actorOf(res), param(req.params.id), input, cancel.signal));
      return;
    }
    await streamBalance(res, (onProgress) => balanceStudy(db, actorOf(res), param(req.params.id), input, cancel.signal, onProgress));
  });
  return r;
}

/** The NDJSON mode: headers go out with the first progress line, so earlier errors stay 4xx JSON. */
async function streamBalance(res: Response, run: (onProgress: (p: BalanceProgressMessage) => void) => Promise<unknown>): Promise<void> {
  let started = false;
  let ended = false;
  const line = (value: unknown) => {
    if (!started) {
      started = true;
      res.status(200).set({ 'Content-Type': `${NDJSON}; charset=utf-8`, 'Cache-Control': 'no-store', 'X-Accel-Buffering': 'no' });
      res.flushHeaders();
    }
    res.write(`${JSON.stringify(value)}\n`);
  };
  try {
    const result = await run((p) => {
      if (!ended && !res.destroyed) line({ progress: { stage: p.stage, solves: p.solves } });
    });
    ended = true;
    line({ result });
    res.end();
  } catch (err) {
    ended = true;
    if (!started) throw err;
    if (res.destroyed) return;
    const error = err instanceof AppError ? { code: err.code, message: err.message } : { code: 'internal', message: 'The balancing failed on the server. Try again in a moment.' };
    res.write(`${JSON.stringify({ error })}\n`);
    res.end();
  }
}
