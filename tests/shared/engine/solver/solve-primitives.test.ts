/**
 * Small hand-checkable networks solved by `solvePrimitives`, each value with its source:
 * (V) seen in a published text, (C) computed from a published problem statement, (M) recalled
 * from memory, (P) common practice. Every solve also passes the invariants (KCL, power balance).
 */
import { describe, expect, it } from 'vitest';
import { createNetwork, solvePrimitives } from '../../../../shared/engine/solver/index.ts';
import type { Cx, Primitive } from '../../../../shared/engine/types.ts';
import { angleDeg, cabs, expectCx, expectInvariants, polar } from '../helpers/invariants.ts';

const mul = (a: Cx, b: Cx): Cx => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
const div = (a: Cx, b: Cx): Cx => {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
};
const sub = (a: Cx, b: Cx): Cx => ({ re: a.re - b.re, im: a.im - b.im });
const add = (a: Cx, b: Cx): Cx => ({ re: a.re + b.re, im: a.im + b.im });
const conj = (a: Cx): Cx => ({ re: a.re, im: -a.im });

function solve(prims: Primitive[]) {
  const sol = solvePrimitives(prims);
  expectInvariants(prims, sol);
  return sol;
}

/** R1: wye generator 120∠0° V/phase behind 0.2+j0.5 Ω, line 0.8+j1.5 Ω, wye load 39+j28 Ω, neutral connected. */
function r1(neutral: 'solid' | 'open' | 'unearthed'): Primitive[] {
  const prims: Primitive[] = [];
  (['a', 'b', 'c'] as const).forEach((p, k) => {
    prims.push({ type: 'voltageSource', id: `E${p}`, plus: `g.${p}`, minus: 'g.n', volts: polar(120, -120 * k), seriesOhms: { re: 0.2, im: 0.5 } });
    prims.push({ type: 'impedance', id: `L${p}`, from: `g.${p}`, to: `l.${p}`, ohms: { re: 0.8, im: 1.5 } });
    prims.push({ type: 'impedance', id: `Z${p}`, from: `l.${p}`, to: 'l.n', ohms: { re: 39, im: 28 } });
  });
  prims.push({ type: 'switch', id: 'N', from: 'g.n', to: 'l.n', closed: neutral !== 'open' });
  if (neutral !== 'unearthed') prims.push({ type: 'switch', id: 'GE', from: 'g.n', to: 'earth', closed: true });
  return prims;
}

describe('solvePrimitives on hand-checkable networks', () => {
  it('voltage divider: 100 V across 30 Ω + 70 Ω gives 70 V and 1 A (P)(C)', () => {
    const prims: Primitive[] = [
      { type: 'voltageSource', id: 'V', plus: 'a', minus: 'earth', volts: { re: 100, im: 0 } },
      { type: 'impedance', id: 'R1', from: 'a', to: 'm', ohms: { re: 30, im: 0 } },
      { type: 'impedance', id: 'R2', from: 'm', to: 'earth', ohms: { re: 70, im: 0 } },
    ];
    const sol = solve(prims);
    expectCx(sol.nodeVolts.get('m'), { re: 70, im: 0 }, 1e-12, 'V(m)');
    expectCx(sol.elementCurrents.get('R1')![0], { re: 1, im: 0 }, 1e-12, 'I(R1)');
    // the source current leaves plus into the circuit
    expectCx(sol.elementCurrents.get('V')![0], { re: 1, im: 0 }, 1e-12, 'I(V)');
    expect(sol.iterations).toBe(1);
    expect(sol.floating).toEqual([]);
    expect(sol.maxKclResidualAmps).toBeLessThan(1e-12);
  });

  it('R1: line current 2.4000∠−36.870° A, load VAN 115.225∠−1.193° V, VAB 199.576∠28.807° V, generator Van 118.898∠−0.324° V — Nilsson & Riedel Ex. 11.1 (V)', () => {
    const sol = solve(r1('solid'));
    const ia = sol.elementCurrents.get('La')![0];
    expect(cabs(ia)).toBeCloseTo(2.4, 4);
    expect(angleDeg(ia)).toBeCloseTo(-36.87, 3);
    const van = sub(sol.nodeVolts.get('l.a')!, sol.nodeVolts.get('l.n')!);
    expect(cabs(van)).toBeCloseTo(115.225, 3);
    expect(angleDeg(van)).toBeCloseTo(-1.193, 3);
    const vab = sub(sol.nodeVolts.get('l.a')!, sol.nodeVolts.get('l.b')!);
    expect(cabs(vab)).toBeCloseTo(199.576, 3);
    expect(angleDeg(vab)).toBeCloseTo(28.807, 3);
    const vgen = sub(sol.nodeVolts.get('g.a')!, sol.nodeVolts.get('g.n')!);
    expect(cabs(vgen)).toBeCloseTo(118.898, 3);
    expect(angleDeg(vgen)).toBeCloseTo(-0.324, 3);
    // S load 673.92 + j483.84 VA (three phases) and S of the EMFs 691.2 + j518.4 VA (V)
    let sLoad = { re: 0, im: 0 };
    let sEmf = { re: 0, im: 0 };
    for (const p of ['a', 'b', 'c']) {
      const i = sol.elementCurrents.get(`Z${p}`)![0];
      sLoad = add(sLoad, mul(sub(sol.nodeVolts.get(`l.${p}`)!, sol.nodeVolts.get('l.n')!), conj(i)));
      const ie = sol.elementCurrents.get(`E${p}`)![0];
      sEmf = add(sEmf, mul(polar(120, -120 * ['a', 'b', 'c'].indexOf(p)), conj(ie)));
    }
    expectCx(sLoad, { re: 673.92, im: 483.84 }, 1e-6, 'S load');
    expectCx(sEmf, { re: 691.2, im: 518.4 }, 1e-6, 'S of the EMFs');
    // balanced: no neutral current (P)
    expect(cabs(sol.elementCurrents.get('N')![0])).toBeLessThan(1e-12);
  });

  it('R1 with the neutral open (balanced): the load star point stays at the source neutral — shift exactly 0 (P)(C)', () => {
    const sol = solve(r1('open'));
    expect(cabs(sol.nodeVolts.get('l.n')!)).toBeLessThan(1e-12);
    expect(cabs(sol.elementCurrents.get('La')![0])).toBeCloseTo(2.4, 4);
  });

  it('R2 unearthed: the whole system floats and is solved with its neutral as reference; Ia 9.3704∠−38.660° A (P)(C)', () => {
    const prims: Primitive[] = [];
    (['a', 'b', 'c'] as const).forEach((p, k) => {
      prims.push({ type: 'voltageSource', id: `E${p}`, plus: `s.${p}`, minus: 's.n', volts: polar(120, -120 * k) });
      prims.push({ type: 'impedance', id: `Z${p}`, from: `s.${p}`, to: 'load.star', ohms: { re: 10, im: 8 } });
    });
    const sol = solve(prims);
    expect(sol.floating).toEqual([{ nodes: ['load.star', 's.a', 's.b', 's.c', 's.n'], referenceNode: 's.n' }]);
    expectCx(sol.nodeVolts.get('s.n'), { re: 0, im: 0 }, 0, 'reference node');
    const ia = sol.elementCurrents.get('Za')![0];
    expect(cabs(ia)).toBeCloseTo(9.3704, 4);
    expect(angleDeg(ia)).toBeCloseTo(-38.66, 3);
    expect(cabs(sol.nodeVolts.get('load.star')!)).toBeLessThan(1e-12);
  });

  it('R12: 120/240 V split phase, 14.4 Ω and 4.8 Ω: neutral 16.667 A; neutral open: 180 V and 60 V (P)(C)', () => {
    const prims = (neutralClosed: boolean): Primitive[] => [
      { type: 'voltageSource', id: 'E1', plus: 'x.l1', minus: 'x.n', volts: { re: 120, im: 0 } },
      { type: 'voltageSource', id: 'E2', plus: 'x.n', minus: 'x.l2', volts: { re: 120, im: 0 } },
      { type: 'switch', id: 'GE', from: 'x.n', to: 'earth', closed: true },
      { type: 'impedance', id: 'R1', from: 'x.l1', to: 'h.n', ohms: { re: 14.4, im: 0 } },
      { type: 'impedance', id: 'R2', from: 'x.l2', to: 'h.n', ohms: { re: 4.8, im: 0 } },
      { type: 'switch', id: 'N', from: 'h.n', to: 'x.n', closed: neutralClosed },
    ];
    const ok = solve(prims(true));
    expect(cabs(ok.elementCurrents.get('N')![0])).toBeCloseTo(16.6667, 4);
    const lost = solve(prims(false));
    expect(cabs(sub(lost.nodeVolts.get('x.l1')!, lost.nodeVolts.get('h.n')!))).toBeCloseTo(180, 9);
    expect(cabs(sub(lost.nodeVolts.get('h.n')!, lost.nodeVolts.get('x.l2')!))).toBeCloseTo(60, 9);
    expect(cabs(lost.elementCurrents.get('N')![0])).toBe(0);
  });

  it('coupled branch: an open conductor picks up −Zm·I of its neighbour; currents per conductor (C)', () => {
    const zs: Cx = { re: 0.4, im: 1.2 };
    const zm: Cx = { re: 0.1, im: 0.5 };
    const load: Cx = { re: 10, im: 2 };
    const prims: Primitive[] = [
      { type: 'voltageSource', id: 'V', plus: 'a', minus: 'earth', volts: polar(100, 20) },
      { type: 'switch', id: 'Gb', from: 'b', to: 'earth', closed: true },
      {
        type: 'coupledBranch',
        id: 'K',
        from: ['a', 'b'],
        to: ['a2', 'b2'],
        ohms: [
          [zs, zm],
          [zm, { re: 0.5, im: 1.1 }],
        ],
      },
      { type: 'impedance', id: 'ZL', from: 'a2', to: 'earth', ohms: load },
      // b2 is left open apart from a high-impedance voltmeter to earth
      { type: 'impedance', id: 'VM', from: 'b2', to: 'earth', ohms: { re: 1e9, im: 0 } },
    ];
    const sol = solve(prims);
    const i1 = div(polar(100, 20), add(zs, load)); // I2 ≈ 0 through the 1 GΩ meter
    expectCx(sol.elementCurrents.get('K')![0], i1, 1e-6, 'I conductor 1');
    expectCx(sol.nodeVolts.get('b2'), mul({ re: -1, im: 0 }, mul(zm, i1)), 1e-5, 'induced voltage');
    expect(sol.elementCurrents.get('K')!.length).toBe(2);
  });

  it('current source: 2∠30° A into 5 Ω ∥ (−j10 Ω) gives V = I·Z (C)', () => {
    const prims: Primitive[] = [
      { type: 'currentSource', id: 'J', from: 'earth', to: 'x', amps: polar(2, 30) },
      { type: 'impedance', id: 'R', from: 'x', to: 'earth', ohms: { re: 5, im: 0 } },
      { type: 'impedance', id: 'C', from: 'x', to: 'earth', ohms: { re: 0, im: -10 } },
    ];
    const sol = solve(prims);
    const z = div(mul({ re: 5, im: 0 }, { re: 0, im: -10 }), { re: 5, im: -10 });
    expectCx(sol.nodeVolts.get('x'), mul(polar(2, 30), z), 1e-12, 'V(x)');
  });

  it('admittance stamp with a non-zero row sum conducts to earth: shunt 0.01 − j0.02 S at 100 V (C)', () => {
    const prims: Primitive[] = [
      { type: 'voltageSource', id: 'V', plus: 'x', minus: 'earth', volts: { re: 100, im: 0 } },
      { type: 'admittanceMatrix', id: 'Y', nodes: ['x'], siemens: [[{ re: 0.01, im: -0.02 }]] },
    ];
    const sol = solve(prims);
    expectCx(sol.elementCurrents.get('Y')![0], { re: 1, im: -2 }, 1e-12, 'I(Y)');
    expectCx(sol.elementCurrents.get('V')![0], { re: 1, im: -2 }, 1e-12, 'I(V)');
  });

  it('ideal source in a chain of ideal sources and switches: currents recovered from KCL (C)', () => {
    // earth —E1(10 V)— a —S— b —E2(5 V)— c, load 5 Ω from c to earth: 15 V, 3 A through everything
    const prims: Primitive[] = [
      { type: 'voltageSource', id: 'E1', plus: 'a', minus: 'earth', volts: { re: 10, im: 0 } },
      { type: 'switch', id: 'S', from: 'a', to: 'b', closed: true },
      { type: 'voltageSource', id: 'E2', plus: 'c', minus: 'b', volts: { re: 5, im: 0 } },
      { type: 'impedance', id: 'R', from: 'c', to: 'earth', ohms: { re: 5, im: 0 } },
    ];
    const sol = solve(prims);
    expectCx(sol.nodeVolts.get('c'), { re: 15, im: 0 }, 1e-12, 'V(c)');
    expectCx(sol.elementCurrents.get('S')![0], { re: 3, im: 0 }, 1e-12, 'I(S) from a to b');
    expectCx(sol.elementCurrents.get('E1')![0], { re: 3, im: 0 }, 1e-12, 'I(E1)');
    expectCx(sol.elementCurrents.get('E2')![0], { re: 3, im: 0 }, 1e-12, 'I(E2)');
  });

  it('floating island: a separate unearthed part is reported with its documented reference', () => {
    const prims: Primitive[] = [
      { type: 'voltageSource', id: 'V', plus: 'a', minus: 'earth', volts: { re: 100, im: 0 } },
      { type: 'impedance', id: 'R', from: 'a', to: 'earth', ohms: { re: 10, im: 0 } },
      // island: no neutral-like name, so the first node in sorted order is the reference
      { type: 'voltageSource', id: 'VI', plus: 'isl.y', minus: 'isl.x', volts: { re: 0, im: 50 }, seriesOhms: { re: 1, im: 0 } },
      { type: 'impedance', id: 'RI', from: 'isl.y', to: 'isl.x', ohms: { re: 4, im: 0 } },
    ];
    const sol = solve(prims);
    expect(sol.floating).toEqual([{ nodes: ['isl.x', 'isl.y'], referenceNode: 'isl.x' }]);
    expectCx(sol.nodeVolts.get('isl.x'), { re: 0, im: 0 }, 0, 'reference');
    expectCx(sol.nodeVolts.get('isl.y'), { re: 0, im: 40 }, 1e-12, 'V(isl.y)');
  });

  it('numerically floating part: an unearthed delta secondary coupled only through admittance stamps (C)', () => {
    // three single-phase units, primary phase-to-earth 230 V, delta secondary, no load. Each unit's
    // stamp y·wwᵀ with w = [1, −1, −a, a] forces V_primary = a·V_secondary when no current flows.
    const a = 0.5;
    const y: Cx = { re: 1, im: -5 };
    const v = [1, -1, -a, a];
    const stamp = (id: string, nodes: string[]): Primitive => ({ type: 'admittanceMatrix', id, nodes, siemens: v.map((vi) => v.map((vj) => ({ re: y.re * vi * vj, im: y.im * vi * vj }))) });
    const prims: Primitive[] = [];
    (['a', 'b', 'c'] as const).forEach((p, k) => prims.push({ type: 'voltageSource', id: `E${p}`, plus: `p.${p}`, minus: 'earth', volts: polar(230, -120 * k) }));
    prims.push(stamp('Ta', ['p.a', 'earth', 'd.1', 'd.2']), stamp('Tb', ['p.b', 'earth', 'd.2', 'd.3']), stamp('Tc', ['p.c', 'earth', 'd.3', 'd.1']));
    const sol = solve(prims);
    expect(sol.floating.length).toBe(1);
    expect(sol.floating[0].nodes).toEqual(['d.1', 'd.2', 'd.3']);
    expect(['d.1', 'd.2', 'd.3']).toContain(sol.floating[0].referenceNode);
    expectCx(sol.nodeVolts.get(sol.floating[0].referenceNode), { re: 0, im: 0 }, 0, 'reference');
    // no load: each secondary winding shows its primary voltage / a = 460 V
    const v12 = sub(sol.nodeVolts.get('d.1')!, sol.nodeVolts.get('d.2')!);
    expectCx(v12, polar(460, 0), 1e-9, 'V(d.1) − V(d.2)');
    const v23 = sub(sol.nodeVolts.get('d.2')!, sol.nodeVolts.get('d.3')!);
    expectCx(v23, polar(460, -120), 1e-9, 'V(d.2) − V(d.3)');
  });

  it('createNetwork: updating values on one topology matches a fresh solve; a switch change re-analyses', () => {
    const base = r1('solid');
    const net = createNetwork(base);
    const s1 = net.solve();
    const heavier = base.map((e) => (e.type === 'impedance' && e.id === 'Za' ? { ...e, ohms: { re: 20, im: 10 } } : e));
    net.update(heavier);
    const s2 = net.solve();
    const fresh = solvePrimitives(heavier);
    for (const [node, v] of fresh.nodeVolts) expectCx(s2.nodeVolts.get(node), v, 1e-12, `V(${node})`);
    expect(cabs(sub(s2.nodeVolts.get('l.a')!, s1.nodeVolts.get('l.a')!))).toBeGreaterThan(1);
    const opened = heavier.map((e) => (e.id === 'N' ? { ...e, closed: false } : e));
    net.update(opened);
    const s3 = net.solve();
    const fresh3 = solvePrimitives(opened);
    for (const [node, v] of fresh3.nodeVolts) expectCx(s3.nodeVolts.get(node), v, 1e-12, `V(${node})`);
    expect(cabs(s3.nodeVolts.get('l.n')!)).toBeGreaterThan(1); // unbalanced load, neutral lost: the star point shifts
    expectInvariants(opened, s3);
  });

  it('createNetwork: an update naming the changed positions (sweeps) matches a fresh solve; a changed switch re-analyses; a bad changed value is refused as a full check words it', () => {
    const base = r1('solid');
    const net = createNetwork(base);
    net.solve();
    const za = base.findIndex((e) => e.id === 'Za');
    const heavier = base.map((e, k) => (k === za ? { ...e, ohms: { re: 20, im: 10 } } : e)) as Primitive[];
    net.update(heavier, [za]);
    const s2 = net.solve();
    for (const [node, v] of solvePrimitives(heavier).nodeVolts) expectCx(s2.nodeVolts.get(node), v, 1e-12, `V(${node})`);
    const n = heavier.findIndex((e) => e.id === 'N');
    const opened = heavier.map((e, k) => (k === n ? { ...e, closed: false } : e)) as Primitive[];
    net.update(opened, [n]);
    const s3 = net.solve();
    for (const [node, v] of solvePrimitives(opened).nodeVolts) expectCx(s3.nodeVolts.get(node), v, 1e-12, `V(${node})`);
    expect(cabs(s3.nodeVolts.get('l.n')!)).toBeGreaterThan(1);
    const zero = opened.map((e, k) => (k === za ? { ...e, ohms: { re: 0, im: 0 } } : e)) as Primitive[];
    let full = '';
    try {
      createNetwork(zero);
    } catch (e) {
      full = (e as Error).message;
    }
    expect(full).toMatch(/Za/);
    expect(() => net.update(zero, [za])).toThrow(full);
  });

  it('createNetwork: a bad value in an update is refused, and the network solves again after a good update', () => {
    const z = (x: number): Cx[][] => [
      [{ re: 1, im: x }, { re: 0, im: 0.5 }],
      [{ re: 0, im: 0.5 }, { re: 1, im: x }],
    ];
    const prims = (x: number): Primitive[] => [
      { type: 'voltageSource', id: 'V', plus: 'a', minus: 'earth', volts: { re: 100, im: 0 } },
      { type: 'switch', id: 'G', from: 'b', to: 'earth', closed: true },
      { type: 'coupledBranch', id: 'K', from: ['a', 'b'], to: ['a2', 'b2'], ohms: z(x) },
      { type: 'impedance', id: 'R', from: 'a2', to: 'b2', ohms: { re: 10, im: 0 } },
    ];
    const net = createNetwork(prims(2));
    const good = net.solve();
    // a singular Z (two equal rows) cannot be inverted into a nodal stamp
    const singular: Primitive[] = prims(2).map((e) => (e.type === 'coupledBranch' ? { ...e, ohms: [[{ re: 1, im: 1 }, { re: 1, im: 1 }], [{ re: 1, im: 1 }, { re: 1, im: 1 }]] } : e));
    expect(() => net.update(singular)).toThrow(/coupled branch 'K' has a singular impedance matrix/);
    expect(() => net.solve()).toThrow(/coupled branch 'K' has a singular impedance matrix/);
    net.update(prims(2));
    const again = net.solve();
    expectCx(again.nodeVolts.get('a2'), good.nodeVolts.get('a2')!, 1e-12, 'V(a2) after recovery');
  });

  it('rotating every source angle by 40° rotates every phasor by 40° (P)', () => {
    const base = r1('solid');
    const rotated = base.map((e) => (e.type === 'voltageSource' ? { ...e, volts: mul(e.volts, polar(1, 40)) } : e));
    const s0 = solve(base);
    const s1 = solve(rotated);
    for (const [node, v] of s0.nodeVolts) expectCx(s1.nodeVolts.get(node), mul(v, polar(1, 40)), 1e-9, `V(${node})`);
  });
});
