/**
 * Per-load terminal voltages: checked against Millman's theorem computed here, independently of
 * the engine (P: Millman's theorem for the star point of a wye of admittances fed by ideal EMFs;
 * values C), and the load's own rating against the limit set.
 */
import { describe, expect, it } from 'vitest';
import { demoCircuits, polar, type CircuitInput, type Cx } from '../../../../shared/engine/index.ts';
import { solveChecked } from '../solve-checked.ts';

const c = (re: number, im = 0): Cx => ({ re, im });
const add = (a: Cx, b: Cx): Cx => c(a.re + b.re, a.im + b.im);
const sub = (a: Cx, b: Cx): Cx => c(a.re - b.re, a.im - b.im);
const mul = (a: Cx, b: Cx): Cx => c(a.re * b.re - a.im * b.im, a.re * b.im + a.im * b.re);
const div = (a: Cx, b: Cx): Cx => {
  const d = b.re * b.re + b.im * b.im;
  return c((a.re * b.re + a.im * b.im) / d, (a.im * b.re - a.re * b.im) / d);
};
const mag = (a: Cx) => Math.hypot(a.re, a.im);

/** Millman: V_star = Σ Vk·Yk / Σ Yk. */
function millman(v: Cx[], z: Cx[]): Cx {
  let num = c(0);
  let den = c(0);
  v.forEach((vk, k) => {
    const y = div(c(1), z[k]);
    num = add(num, mul(vk, y));
    den = add(den, y);
  });
  return div(num, den);
}

const EMF = [polar(120, 0), polar(120, -120), polar(120, 120)];

describe('single-phase loads behind an open service neutral (10, 20, 30 Ω on an ideal 120 V source)', () => {
  const rLine = 0.001;
  const circuit = (open: boolean): CircuitInput => ({
    format: 'wyeward-circuit',
    version: 1,
    frequencyHz: 60,
    elements: [
      { type: 'source', id: 'S', bus: 'SVC', kvLL: 0.12 * Math.sqrt(3) },
      { type: 'line', id: 'DROP', from: 'SVC', to: 'H', length: 1, impedance: { kind: 'perConductor', ohmsPerLength: { a: rLine, b: rLine, c: rLine, n: rLine } }, open: open ? ['n'] : [] },
      { type: 'load', id: 'LA', bus: 'H', connection: 'single', between: ['a', 'n'], each: { ohms: 10 } },
      { type: 'load', id: 'LB', bus: 'H', connection: 'single', between: ['b', 'n'], each: { ohms: 20 } },
      { type: 'load', id: 'LC', bus: 'H', connection: 'single', between: ['c', 'n'], each: { ohms: 30 } },
    ],
  });

  it("each load's terminal voltage is Zk·(Vk − V_star)/(Zk + Z_line) with V_star by Millman (P; values C)", () => {
    const r = solveChecked(circuit(true));
    // each load in series with its 0.001 Ω phase conductor; the open neutral carries nothing
    const z = [10, 20, 30].map((x) => c(x + rLine));
    const vStar = millman(EMF, z);
    // (C) hand value for 120 V: V_star = (7 − j1.732)/0.18333 ≈ 38.18 − j9.45 V
    expect(vStar.re).toBeCloseTo(38.18, 1);
    expect(vStar.im).toBeCloseTo(-9.45, 1);
    ['LA', 'LB', 'LC'].forEach((id, k) => {
      const expected = div(mul(c([10, 20, 30][k]), sub(EMF[k], vStar)), z[k]);
      const got = r.loads.find((l) => l.id === id)!.branches[0];
      expect(mag(sub(got.voltage, expected))).toBeLessThan(1e-9 * 120);
      expect(got.ratedVolts).toBeCloseTo(120, 9); // bus nominal 0.12·√3 kV line to line
      expect(got.ratedFrom).toBe('bus');
      expect(got.pu!).toBeCloseTo(mag(expected) / 120, 12);
    });
  });

  it('flags each load against its own terminal voltage: the 10 Ω load sags, the 30 Ω one rises (ANSI C84.1 Range B 110–127 V on 120 V; M)', () => {
    const r = solveChecked(circuit(true));
    const byId = Object.fromEntries(r.loads.map((l) => [l.id, l.branches[0]]));
    // |LA| ≈ 94.0 V, |LB| ≈ 143.3 V, |LC| ≈ 153.7 V from the Millman values above (C)
    expect(byId.LA.status).toBe('violation-low');
    expect(byId.LC.status).toBe('violation-high');
    const flags = r.flags.filter((f) => f.elementId === 'LC');
    expect(flags.map((f) => [f.code, f.severity])).toEqual([['load-voltage-high', 'violation']]);
    expect(flags[0].message).toMatch(/^load LC has 1\d\d\.\d V across its terminals = 1\.\d{3} pu of its 120\.0 V rating, above the violation limit 1\.058 pu$/);
  });

  it('with the neutral intact every load sees its phase voltage less a milliohm drop: no load flags (P)', () => {
    const r = solveChecked(circuit(false));
    for (const l of r.loads) {
      expect(l.branches[0].status).toBe('ok');
      expect(Math.abs(l.branches[0].voltage.mag - 120)).toBeLessThan(0.05);
    }
    expect(r.flags.filter((f) => f.code.startsWith('load-voltage'))).toEqual([]);
  });
});

describe('a floating-star wye load (10, 20, 30 Ω) on an ideal 208Y/120 V bus', () => {
  it("branch voltages are Vk − V_star with V_star by Millman over the load's own impedances (P; values C)", () => {
    const r = solveChecked({
      format: 'wyeward-circuit',
      version: 1,
      frequencyHz: 60,
      elements: [
        { type: 'source', id: 'S', bus: 'B', kvLL: 0.12 * Math.sqrt(3) },
        { type: 'load', id: 'W', bus: 'B', connection: 'wyeFloating', phases: { a: { ohms: 10 }, b: { ohms: 20 }, c: { ohms: 30 } } },
      ],
    });
    const vStar = millman(EMF, [c(10), c(20), c(30)]);
    const w = r.loads.find((l) => l.id === 'W')!;
    expect(w.branches.map((b) => [b.branch, b.fromConductor, b.toConductor])).toEqual([
      ['a', 'a', 'star'],
      ['b', 'b', 'star'],
      ['c', 'c', 'star'],
    ]);
    w.branches.forEach((b, k) => expect(mag(sub(b.voltage, sub(EMF[k], vStar)))).toBeLessThan(1e-9 * 120));
    // The bus itself is balanced, so only the load's own voltages can show the hazard.
    expect(r.flags.some((f) => f.code === 'voltage-high' || f.code === 'voltage-low')).toBe(false);
    // (C) |Va − V_star| ≈ 82.4 V (low), |Vb − V_star| ≈ 136.3 V and |Vc − V_star| ≈ 150.0 V (high)
    expect(w.branches.map((b) => b.status)).toEqual(['violation-low', 'violation-high', 'violation-high']);
    expect(r.flags.filter((f) => f.elementId === 'W').map((f) => f.conductor)).toEqual(['a', 'b', 'c']);
  });
});

describe("a load's own rating", () => {
  const base = (load: Record<string, unknown>): CircuitInput => ({
    format: 'wyeward-circuit',
    version: 1,
    frequencyHz: 60,
    elements: [{ type: 'source', id: 'S', bus: 'B', kvLL: 0.208 }, { type: 'load', id: 'L', bus: 'B', ...load } as CircuitInput['elements'][number]],
  });
  it('a 230 V appliance on a healthy 120 V phase is flagged low although the bus is within its range (P)', () => {
    const r = solveChecked(base({ connection: 'single', between: ['a', 'n'], ratedVolts: 230, each: { ohms: 50 } }));
    const b = r.loads[0].branches[0];
    expect(b.ratedVolts).toBe(230);
    expect(b.ratedFrom).toBe('load');
    expect(b.pu!).toBeCloseTo(208 / Math.sqrt(3) / 230, 9); // ideal source: the full phase voltage (C)
    expect(b.status).toBe('violation-low');
    expect(r.flags.filter((f) => f.bus === 'B')).toEqual([]);
  });
  it('a delta load is rated line to line from its kvLL (P)', () => {
    const r = solveChecked(base({ connection: 'delta', kvLL: 0.24, each: { kw: 1, kvar: 0 } }));
    for (const b of r.loads[0].branches) {
      expect(b.ratedVolts).toBeCloseTo(240, 9);
      expect(b.pu!).toBeCloseTo(208 / 240, 9);
      expect(b.status).toBe('violation-low'); // 0.867 pu < 0.917 (C)
    }
  });
});

describe('demo "open-neutral-208y120"', () => {
  const r = solveChecked(demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit);
  it('ELECTRONICS sees about 167 V = 1.39 pu across its own terminals and is flagged (engine value, P)', () => {
    const e = r.loads.find((l) => l.id === 'ELECTRONICS')!.branches[0];
    // its terminals are HOUSE.c and HOUSE.n: the same as the bus c-n voltage here (no switch in between)
    const house = r.buses.find((b) => b.bus === 'HOUSE')!;
    expect(Math.abs(e.voltage.mag - house.lineToNeutral.c.mag)).toBeLessThan(1e-9);
    expect(e.pu!).toBeGreaterThan(1.38);
    expect(e.pu!).toBeLessThan(1.40);
    expect(r.flags.some((f) => f.elementId === 'ELECTRONICS' && f.severity === 'violation')).toBe(true);
    expect(r.flags.some((f) => f.elementId === 'HEATER' && f.code === 'load-voltage-low')).toBe(true);
  });
});
