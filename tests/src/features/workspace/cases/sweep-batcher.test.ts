/** Chunks arriving while a sweep runs are redrawn at most once per animation frame, none dropped or handed twice. */
import { describe, expect, it } from 'vitest';
import { createBatcher, type Range } from '../../../../../src/features/workspace/cases/sweep-batcher.ts';

/** Frames and timers driven by hand, on a clock driven by hand. */
function fakeTime() {
  let t = 0;
  let frames: (() => void)[] = [];
  let timers: { at: number; cb: () => void }[] = [];
  return {
    now: () => t,
    requestFrame: (cb: () => void) => void frames.push(cb),
    setTimer: (cb: () => void, ms: number) => void timers.push({ at: t + ms, cb }),
    /** Advances the clock by ms, firing timers due, then runs one frame. */
    frame(ms = 16) {
      t += ms;
      const due = timers.filter((x) => x.at <= t);
      timers = timers.filter((x) => x.at > t);
      due.forEach((x) => x.cb());
      const run = frames;
      frames = [];
      run.forEach((cb) => cb());
    },
    pendingFrames: () => frames.length,
  };
}

describe('sweep batcher', () => {
  it('hands every queued chunk over exactly once, at most once per frame and at most once per interval', () => {
    const time = fakeTime();
    const flushes: { at: number; ranges: Range[] }[] = [];
    const b = createBatcher((ranges) => flushes.push({ at: time.now(), ranges }), { minInterval: 100, ...time });
    const pushed: Range[] = [];
    let start = 0;
    for (let frame = 0; frame < 60; frame++) {
      for (let k = 0; k < (frame % 3) + 1; k++) {
        const r: Range = [start, 7];
        start += 7;
        pushed.push(r);
        b.push(...r);
      }
      expect(time.pendingFrames()).toBeLessThanOrEqual(1); // one frame asked for, however many chunks came
      time.frame();
    }
    for (let k = 0; k < 10; k++) time.frame();
    const handed = flushes.flatMap((f) => f.ranges);
    expect(handed).toEqual(pushed);
    expect(flushes.length).toBeGreaterThan(3);
    expect(flushes.length).toBeLessThan(pushed.length / 3);
    for (let k = 1; k < flushes.length; k++) expect(flushes[k].at - flushes[k - 1].at).toBeGreaterThanOrEqual(100);
  });

  it('flushNow hands over at once what is queued; cancel drops the rest', () => {
    const time = fakeTime();
    const flushes: Range[][] = [];
    const b = createBatcher((ranges) => flushes.push(ranges), { minInterval: 100, ...time });
    b.push(0, 5);
    time.frame(200);
    b.push(5, 5);
    b.push(10, 5);
    b.flushNow();
    expect(flushes).toEqual([[[0, 5]], [[5, 5], [10, 5]]]);
    time.frame(200);
    expect(flushes).toHaveLength(2); // the frame asked for before flushNow hands nothing twice
    b.push(15, 5);
    b.cancel();
    time.frame(200);
    b.flushNow();
    expect(flushes).toHaveLength(2);
  });
});

describe('sweep batcher on a busy page', () => {
  it('spaces redraws out to backoff times the cost of the last one, between the shortest and longest interval', () => {
    const time = fakeTime();
    const flushes: number[] = [];
    // a redraw's cost is the time from handing over to the next frame
    const b = createBatcher(() => void flushes.push(time.now()), { minInterval: 100, backoff: 6, maxInterval: 1000, ...time });
    const run = (frames: number, step: number) => {
      for (let k = 0; k < frames; k++) {
        b.push(k, 1);
        time.frame(step);
      }
    };
    // quiet: each frame comes 16 ms after a redraw, 6 × 16 < 100: the shortest interval holds
    run(60, 16);
    expect(b.interval).toBe(100);
    const quiet = flushes.length;
    for (let k = 1; k < quiet; k++) expect(flushes[k] - flushes[k - 1]).toBeGreaterThanOrEqual(100);
    // busy: frames come 120 ms apart, so a redraw costs 120 ms: the next ones wait 720 ms
    run(40, 120);
    expect(b.interval).toBe(720);
    const busy = flushes.slice(quiet);
    for (let k = 2; k < busy.length; k++) expect(busy[k] - busy[k - 1]).toBeGreaterThanOrEqual(720);
    // very busy: capped at the longest interval
    run(40, 400);
    expect(b.interval).toBe(1000);
  });
});
