import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit } from '../../../../../shared/engine/index.ts';
import { arrowHead, busVectors, labelPosition, layoutVectors, makeFrame, midLabelPosition, niceScale, sequenceVectors, ticks } from '../../../../../src/features/workspace/results/phasor-geometry.ts';

const demo = (key: string) => solveCircuit(demoCircuits.find((d) => d.key === key)!.circuit);

describe('niceScale', () => {
  it('picks a 1-2-2.5-5 step and a whole number of steps covering the maximum', () => {
    expect(niceScale(167.3)).toEqual({ step: 50, extent: 200 }); // 167.3/4 = 41.8 → 50
    expect(niceScale(7199.6)).toEqual({ step: 2000, extent: 8000 }); // 1800 → 2000
    expect(niceScale(120, 4)).toEqual({ step: 50, extent: 150 }); // 30 → 50
    expect(niceScale(0.9)).toEqual({ step: 0.25, extent: 1 }); // 0.225 → 0.25
    expect(niceScale(4)).toEqual({ step: 1, extent: 4 });
  });
  it('does not add a ring for floating-point leftovers', () => {
    expect(niceScale(150, 3)).toEqual({ step: 50, extent: 150 });
  });
  it('falls back to a unit scale for zero, negative or non-finite maxima', () => {
    expect(niceScale(0)).toEqual({ step: 1, extent: 1 });
    expect(niceScale(Number.NaN)).toEqual({ step: 1, extent: 1 });
  });
  it('lists ticks out to the extent', () => {
    expect(ticks({ step: 50, extent: 200 })).toEqual([50, 100, 150, 200]);
  });
});

describe('makeFrame', () => {
  it('puts the origin at the centre and the extent at the padding', () => {
    const f = makeFrame([{ re: 120, im: 0 }], 300, 30);
    expect(f.extent).toBe(150);
    expect(f.toScreen({ re: 0, im: 0 })).toEqual({ x: 150, y: 150 });
    expect(f.toScreen({ re: 150, im: 0 })).toEqual({ x: 270, y: 150 });
  });
  it('draws the imaginary axis up: +j goes to smaller screen y', () => {
    const f = makeFrame([{ re: 0, im: 100 }], 200, 20);
    const p = f.toScreen({ re: 0, im: 100 });
    expect(p.x).toBeCloseTo(100, 9);
    expect(p.y).toBeLessThan(100);
  });
  it('keeps angles counter-clockwise: 1∠30° and 1∠−120° land at those screen angles', () => {
    const f = makeFrame([{ re: 1, im: 0 }], 200, 20);
    for (const deg of [30, -120, 150]) {
      const r = (deg * Math.PI) / 180;
      const p = f.toScreen({ re: Math.cos(r), im: Math.sin(r) });
      expect((Math.atan2(f.cy - p.y, p.x - f.cx) * 180) / Math.PI).toBeCloseTo(deg, 9);
    }
  });
});

describe('arrowHead', () => {
  it('has its point at the tip and a base of the requested width, length back along the shaft', () => {
    const head = arrowHead({ x: 0, y: 0 }, { x: 100, y: 0 }, 10, 4)!;
    expect(head[0]).toEqual({ x: 100, y: 0 });
    expect(head[1].x).toBeCloseTo(90, 9);
    expect(head[2].x).toBeCloseTo(90, 9);
    expect(Math.abs(head[1].y - head[2].y)).toBeCloseTo(8, 9);
  });
  it('shrinks on a short vector so the shaft stays visible, and is absent on a zero vector', () => {
    const head = arrowHead({ x: 0, y: 0 }, { x: 0, y: -6 }, 10, 4)!;
    expect(Math.hypot(head[1].x - 0, head[1].y + 3)).toBeCloseTo(1.2, 9); // h = 3, w = 4·3/10
    expect(arrowHead({ x: 5, y: 5 }, { x: 5, y: 5 })).toBeNull();
  });
});

describe('labelPosition', () => {
  it('places the label beyond the tip and anchors it away from the vector', () => {
    expect(labelPosition({ x: 0, y: 0 }, { x: 50, y: 0 }, 10)).toMatchObject({ x: 60, y: 0, anchor: 'start', baseline: 'middle' });
    expect(labelPosition({ x: 0, y: 0 }, { x: -50, y: 0 }, 10)).toMatchObject({ x: -60, anchor: 'end' });
    expect(labelPosition({ x: 0, y: 0 }, { x: 0, y: -50 }, 10)).toMatchObject({ y: -60, anchor: 'middle', baseline: 'auto' });
  });
});

describe('midLabelPosition', () => {
  it('puts a side label at the middle of the side, on the side away from the given point', () => {
    // side from (0,0) to (100,0); centre below it (y = 50) → label above (smaller y)
    expect(midLabelPosition({ x: 0, y: 0 }, { x: 100, y: 0 }, { x: 50, y: 50 }, 9)).toMatchObject({ x: 50, y: -9, anchor: 'middle', baseline: 'auto' });
    expect(midLabelPosition({ x: 0, y: 0 }, { x: 100, y: 0 }, { x: 50, y: -50 }, 9)).toMatchObject({ x: 50, y: 9, baseline: 'hanging' });
  });
});

describe('busVectors on an engine result', () => {
  // (C) KVL: V_x-earth − V_n-earth = V_x-n, and V_ab = V_a-earth − V_b-earth; values from the engine's own solve.
  it('open-neutral demo: the neutral-shift vector is V_n-earth and each line-to-neutral vector ends at the phase point', () => {
    const bus = demo('open-neutral-208y120').buses.find((b) => b.bus === 'HOUSE')!;
    const vs = busVectors(bus);
    const shift = vs.find((v) => v.set === 'shift')!;
    expect(Math.hypot(shift.to.re, shift.to.im)).toBeCloseTo(bus.neutralToEarth!.mag, 9);
    expect(shift.value.mag).toBeCloseTo(56.84, 1); // engine value printed by the demo solve
    for (const ph of ['a', 'b', 'c']) {
      const v = vs.find((x) => x.id === `ln-${ph}`)!;
      expect(v.from).toBe(shift.to);
      expect(v.to.re - v.from.re).toBeCloseTo(bus.lineToNeutral[ph].re, 6);
      expect(v.to.im - v.from.im).toBeCloseTo(bus.lineToNeutral[ph].im, 6);
    }
    for (const pair of ['ab', 'bc', 'ca']) {
      const v = vs.find((x) => x.id === `ll-${pair}`)!;
      expect(v.to.re - v.from.re).toBeCloseTo(bus.lineToLine[pair].re, 6);
      expect(v.to.im - v.from.im).toBeCloseTo(bus.lineToLine[pair].im, 6);
    }
  });
  it('a bus without a neutral has no shift vector and draws its set from the origin', () => {
    const bus = demo('delta-wye-bank').buses.find((b) => b.bus === 'PMT')!;
    const vs = busVectors(bus);
    expect(vs.some((v) => v.set === 'shift')).toBe(false);
    expect(vs.filter((v) => v.set === 'ln').every((v) => v.from.re === 0 && v.from.im === 0)).toBe(true);
  });
  it('split-phase bus: legs 1 and 2 and the 1–2 voltage', () => {
    const bus = demo('split-phase-120-240').buses.find((b) => b.bus === 'BARN')!;
    expect(busVectors(bus).map((v) => v.id).sort()).toEqual(['ll-12', 'ln-1', 'ln-2', 'shift']);
  });
  it('lays the vectors out in a frame that holds every end point', () => {
    const bus = demo('open-neutral-208y120').buses.find((b) => b.bus === 'HOUSE')!;
    const { frame, vectors } = layoutVectors([...busVectors(bus), ...sequenceVectors(bus.sequence!)], 320, 36);
    expect(frame.extent).toBeGreaterThanOrEqual(Math.max(...Object.values(bus.toEarth).map((p) => p.mag)));
    for (const v of vectors) for (const p of [v.tail, v.tip]) {
      expect(p.x).toBeGreaterThanOrEqual(36 - 1e-9);
      expect(p.x).toBeLessThanOrEqual(320 - 36 + 1e-9);
    }
  });
});
