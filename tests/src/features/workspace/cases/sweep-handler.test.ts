import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit, sweepCircuit, sweepPoints, type CircuitInput } from '../../../../../shared/engine/index.ts';
import { CSV_CAUTION, sweepCsv } from '../../../../../src/features/workspace/cases/sweep-csv.ts';
import { createSweepHandler } from '../../../../../src/features/workspace/cases/sweep-handler.ts';
import { availableOutputs, outputValue } from '../../../../../shared/review/sweep-outputs.ts';
import { chunkSize, SweepPool } from '../../../../../src/features/workspace/cases/sweep-pool.ts';
import { SweepStore } from '../../../../../src/features/workspace/cases/sweep-store.ts';

const openNeutral = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit as CircuitInput;
const outputs = availableOutputs(solveCircuit(openNeutral));

describe('sweep worker handler', () => {
  it('each point equals solving the swept circuit directly; a failing point is reported in its row', () => {
    const handle = createSweepHandler();
    const points = sweepPoints([{ from: 0.5, to: 6, steps: 5 }]).concat([[-1e9]]);
    const res = handle({ kind: 'chunk', job: 1, start: 0, points, setup: { circuit: openNeutral, paths: ['KITCHEN.each.kw'], outputs: outputs.map((o) => o.spec) } });
    if (res.kind !== 'chunk') throw new Error('expected rows');
    // packed point-major in one Float64Array (moved to the page, not copied)
    expect(res.rows.count).toBe(6);
    expect(res.rows.values).toBeInstanceOf(Float64Array);
    expect(res.rows.values).toHaveLength(6 * outputs.length);
    const store = new SweepStore(6, outputs.length);
    store.put(res.start, res.rows);
    points.slice(0, 5).forEach((p, i) => {
      const direct = solveCircuit(sweepCircuit(openNeutral, ['KITCHEN.each.kw'], p));
      outputs.forEach((o, k) => expect(store.row(i)!.outputs[k]).toBeCloseTo(outputValue(direct, o.spec) as number, 9));
      expect(store.row(i)!.error).toBeUndefined();
    });
    expect(store.row(5)!.error).toBeTruthy();
    expect(store.row(5)!.outputs.every((v) => v === null)).toBe(true);
    expect(store.failed).toBe(1);
  });

  it('the setup comes with the first chunk of a sweep only: later chunks of that job use it; a chunk of another job without one is refused in every row', () => {
    const handle = createSweepHandler();
    const setup = { circuit: openNeutral, paths: ['KITCHEN.each.kw'], outputs: outputs.map((o) => o.spec) };
    const points = sweepPoints([{ from: 0.5, to: 6, steps: 6 }]);
    const first = handle({ kind: 'chunk', job: 7, start: 0, points: points.slice(0, 3), setup });
    const later = handle({ kind: 'chunk', job: 7, start: 3, points: points.slice(3) });
    const store = new SweepStore(6, outputs.length);
    for (const res of [first, later]) {
      if (res.kind !== 'chunk') throw new Error('expected rows');
      store.put(res.start, res.rows);
    }
    expect(store.done).toBe(6);
    expect(store.failed).toBe(0);
    points.forEach((p, i) => {
      const direct = solveCircuit(sweepCircuit(openNeutral, ['KITCHEN.each.kw'], p));
      outputs.forEach((o, k) => expect(store.row(i)!.outputs[k]).toBeCloseTo(outputValue(direct, o.spec) as number, 9));
    });
    const stray = handle({ kind: 'chunk', job: 8, start: 0, points: points.slice(0, 2) });
    if (stray.kind !== 'chunk') throw new Error('expected rows');
    expect(stray.rows.count).toBe(2);
    expect(stray.rows.errors.map(([p]) => p)).toEqual([0, 1]);
    expect(stray.rows.errors[0][1]).toMatch(/run the sweep again/);
  });

  it('the pool sends each worker the circuit once per sweep, with its first chunk', async () => {
    const pool = new SweepPool(2);
    const sent: { job: number; setup: boolean }[] = [];
    const points = sweepPoints([{ from: 1, to: 4, steps: 30 }]);
    const run = () =>
      new Promise<void>((resolve, reject) =>
        pool.run({ circuit: openNeutral, paths: ['HEATER.each.kw'], points, outputs: [outputs[0].spec] }, { onRows: () => {}, onDone: resolve, onFailure: reject }),
      );
    // watch what the page posts to each (in-page) worker
    const slots = (pool as unknown as { slots: ({ post(r: unknown): void } | null)[] }).slots;
    pool.warm();
    slots.forEach((s) => {
      const post = s!.post;
      s!.post = (r) => {
        const req = r as { job: number; setup?: unknown };
        sent.push({ job: req.job, setup: !!req.setup });
        post(r);
      };
    });
    await run();
    await run();
    const jobs = [...new Set(sent.map((x) => x.job))];
    expect(jobs).toHaveLength(2);
    for (const job of jobs) {
      const mine = sent.filter((x) => x.job === job);
      expect(mine.length).toBe(Math.ceil(points.length / chunkSize(points.length, 2)));
      expect(mine.filter((x) => x.setup)).toHaveLength(2);
    }
    pool.dispose();
  });

  it('CSV: the caution first, units in the header, one row per point with its status', () => {
    const csv = sweepCsv(['KITCHEN every phase › P (kW)'], outputs.slice(0, 1), [[1], [2]], [{ outputs: [0.98] }, { outputs: [null], error: 'cannot be solved' }]);
    // CRLF line ends, as the product's other CSV exports (shared/report/csv.ts); no bare CR or LF
    expect(csv.endsWith('\r\n')).toBe(true);
    expect(csv.replace(/\r\n/g, '')).not.toMatch(/[\r\n]/);
    const lines = csv.slice(0, -2).split('\r\n');
    expect(lines).toHaveLength(4);
    expect(lines[0]).toBe(CSV_CAUTION);
    expect(lines[1]).toBe(`KITCHEN every phase › P (kW),${outputs[0].label} (${outputs[0].unit}),status`);
    expect(lines[2]).toBe('1,0.98,ok');
    expect(lines[3]).toBe('2,,does not solve: cannot be solved');
    // a message with a line break or a quote stays in its one quoted cell
    const broken = sweepCsv(['x'], outputs.slice(0, 1), [[1]], [{ outputs: [null], error: 'one\rtwo\r\nthree, "four"' }]);
    expect(broken.endsWith('1,,"does not solve: one\rtwo\r\nthree, ""four"""\r\n')).toBe(true);
  });
});

describe('sweep pool (in the page thread where Workers do not exist)', () => {
  it('delivers every point once, in chunks, with the count done', async () => {
    const pool = new SweepPool(2);
    const points = sweepPoints([{ from: 1, to: 4, steps: 4 }, { from: 0.5, to: 2, steps: 3 }]);
    const store = new SweepStore(points.length, 1);
    const dones: number[] = [];
    await new Promise<void>((resolve, reject) =>
      pool.run(
        { circuit: openNeutral, paths: ['HEATER.each.kw', 'KITCHEN.each.kw'], points, outputs: [outputs[0].spec] },
        { onRows: (at, rs, done) => (expect(store.put(at, rs)).toBe(rs.count), dones.push(done)), onDone: resolve, onFailure: reject },
      ),
    );
    const rows = store.rows();
    expect(store.done).toBe(points.length);
    expect(rows.every((r) => r && !r.error)).toBe(true);
    expect(dones[dones.length - 1]).toBe(points.length);
    expect(dones.length).toBe(Math.ceil(points.length / chunkSize(points.length, 2)));
    const direct = solveCircuit(sweepCircuit(openNeutral, ['HEATER.each.kw', 'KITCHEN.each.kw'], points[7]));
    expect(rows[7]!.outputs[0]).toBeCloseTo(outputValue(direct, outputs[0].spec) as number, 9);
    pool.dispose();
  });

  it('cancel stops every worker of the pool that is running a chunk, and the next run starts them afresh', async () => {
    const pool = new SweepPool(2);
    pool.warm();
    const slots = (pool as unknown as { slots: ({ terminate(): void } | null)[] }).slots;
    const stopped: number[] = [];
    slots.forEach((s, i) => {
      const terminate = s!.terminate;
      s!.terminate = () => (stopped.push(i), terminate());
    });
    const points = sweepPoints([{ from: 1, to: 4, steps: 40 }]);
    let seen = 0;
    const run = pool.run({ circuit: openNeutral, paths: ['HEATER.each.kw'], points, outputs: [outputs[0].spec] }, { onRows: (_a, rs) => (seen += rs.count), onDone: () => {}, onFailure: () => {} });
    run.cancel();
    expect(stopped.sort()).toEqual([0, 1]);
    expect(slots).toEqual([null, null]);
    await new Promise((r) => setTimeout(r, 50));
    expect(seen).toBe(0);
    // a new run gets new workers and every point
    const store = new SweepStore(points.length, 1);
    await new Promise<void>((resolve, reject) => pool.run({ circuit: openNeutral, paths: ['HEATER.each.kw'], points, outputs: [outputs[0].spec] }, { onRows: (at, rs) => void store.put(at, rs), onDone: resolve, onFailure: reject }));
    expect(store.done).toBe(points.length);
    pool.dispose();
  });

  it('cancel stops the run: no more rows and no completion', async () => {
    const pool = new SweepPool(1);
    const points = sweepPoints([{ from: 1, to: 4, steps: 40 }]);
    let seen = 0;
    let finished = false;
    const run = pool.run({ circuit: openNeutral, paths: ['HEATER.each.kw'], points, outputs: [outputs[0].spec] }, { onRows: (_a, rs) => (seen += rs.count), onDone: () => (finished = true), onFailure: () => {} });
    run.cancel();
    await new Promise((r) => setTimeout(r, 50));
    expect(seen).toBe(0);
    expect(finished).toBe(false);
    pool.dispose();
  });
});
