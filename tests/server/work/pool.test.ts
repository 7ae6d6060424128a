/** The work pool (server/work): large jobs run in a worker thread with the same answers as inline, within a time limit. */
import { afterAll, describe, expect, it } from 'vitest';
import { demoCircuits } from '../../../shared/engine/index.ts';
import { AppError } from '../../../server/errors.ts';
import { createWorkPool, INLINE_ELEMENTS } from '../../../server/work/pool.ts';
import { prepare } from '../../../server/work/tasks.ts';
import { resultsCsv } from '../../../server/report/csv.ts';

/** A valid circuit with `n` single-phase loads on the split-phase demo's first bus (large enough for a thread). */
function bigCircuit(n: number) {
  const base = structuredClone(demoCircuits.find((d) => d.key === 'split-phase-120-240')!.circuit) as { elements: Record<string, unknown>[] };
  const load = base.elements.find((e) => e.type === 'load')!;
  const extra = Array.from({ length: n }, (_, i) => ({ ...load, id: `EXTRA-${i}` }));
  return { ...base, elements: [...base.elements, ...extra] };
}

const pool = createWorkPool({ threads: 1, timeoutMs: 60_000 });
afterAll(() => pool.close());

describe('work pool', () => {
  it('solves a large circuit in a worker thread to the same summary as inline', async () => {
    const circuit = bigCircuit(INLINE_ELEMENTS + 10);
    const threaded = await pool.prepare(circuit);
    expect(threaded.ok).toBe(true);
    expect(threaded).toEqual(prepare(circuit));
  });

  it('returns the engine issues of an invalid circuit', async () => {
    const circuit = bigCircuit(INLINE_ELEMENTS + 10);
    (circuit.elements[3] as Record<string, unknown>).type = 'no-such-element';
    const res = await pool.prepare(circuit);
    expect(res.ok).toBe(false);
    if (!res.ok) expect(res.issues.map((i) => i.path).join(' ')).toMatch(/elements.3/);
  });

  it('makes the report and the CSV of a large study in the thread (the CSV the same as inline)', async () => {
    const content = { circuit: bigCircuit(INLINE_ELEMENTS + 10) };
    const csv = await pool.csv({ content, units: 'si', table: 'loads' });
    expect(csv).toEqual(resultsCsv({ content, units: 'si', table: 'loads' }));
    expect(csv.ok && csv.csv.split('\r\n').length).toBeGreaterThan(INLINE_ELEMENTS);
    const pdf = await pool.report({
      study: { name: 'Large', team: 'Team' },
      revision: { number: 1, author: 'A', createdAt: '2026-12-02T00:00:00.000Z', message: '' },
      review: { status: 'Draft — not reviewed', approved: false },
      units: 'si',
      content,
      madeAt: '2026-12-02T00:00:00.000Z',
    });
    expect(pdf).toBeInstanceOf(Uint8Array);
    expect(Buffer.from(pdf.subarray(0, 5)).toString()).toBe('%PDF-');
    expect(pdf.byteLength).toBeGreaterThan(10_000);
  });

  it('stops a job past its time limit and answers 503 with a plain message', async () => {
    const hasty = createWorkPool({ threads: 1, timeoutMs: 1 });
    try {
      const err = await hasty.prepare(bigCircuit(2000)).catch((e: unknown) => e);
      expect(err).toBeInstanceOf(AppError);
      expect((err as AppError).status).toBe(503);
      expect((err as AppError).message).toMatch(/took longer than/);
      // The pool still works afterwards.
      expect((await hasty.prepare(bigCircuit(1))).ok).toBe(true);
    } finally {
      await hasty.close();
    }
  });
});
