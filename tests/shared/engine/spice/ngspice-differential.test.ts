/**
 * Differential tests against ngspice (Debian package `ngspice`, a general-purpose circuit
 * simulator): the same seeded random network is solved by the engine and by `ngspice -b` (AC at
 * 60 Hz), and every node voltage must agree to 1e-6 of the largest node voltage; the currents of
 * ideal sources and closed switches (which the engine recovers from KCL along its supernode trees)
 * must agree to 1e-6 of the largest such current. The test fails — it does not skip — when
 * ngspice is missing (`npm test` installs it).
 */
import { existsSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { solvePrimitives } from '../../../../shared/engine/solver/index.ts';
import type { Cx, Primitive } from '../../../../shared/engine/types.ts';
import { cabs, expectInvariants, polar } from '../helpers/invariants.ts';
import { NGSPICE, spiceSolve } from './netlist.ts';
import { randomNetwork } from './random-network.ts';

const FREQ = 60;
const REL = 1e-6;

function compare(prims: Primitive[], label: string) {
  const sol = solvePrimitives(prims);
  expectInvariants(prims, sol);
  const refs = sol.floating.map((f) => f.referenceNode);
  const spice = spiceSolve(prims, FREQ, refs);
  let vmax = 0;
  for (const v of spice.nodeVolts.values()) vmax = Math.max(vmax, cabs(v));
  let worst = 0;
  let worstNode = '';
  for (const [node, vs] of spice.nodeVolts) {
    const ours = sol.nodeVolts.get(node);
    expect(ours, `${label}: node '${node}' missing from the engine's result`).toBeDefined();
    const d = Math.hypot(ours!.re - vs.re, ours!.im - vs.im);
    if (d > worst) {
      worst = d;
      worstNode = node;
    }
  }
  expect(worst / vmax, `${label}: worst node '${worstNode}' differs by ${worst} V (largest node voltage ${vmax} V)`).toBeLessThanOrEqual(REL);
  let imax = 0;
  for (const i of spice.currents.values()) imax = Math.max(imax, cabs(i));
  for (const [id, is] of spice.currents) {
    const ours = sol.elementCurrents.get(id)![0];
    const d = Math.hypot(ours.re - is.re, ours.im - is.im);
    expect(d, `${label}: current of '${id}' ${ours.re} + j${ours.im} vs ngspice ${is.re} + j${is.im}`).toBeLessThanOrEqual(REL * Math.max(imax, 1e-9));
  }
  return sol;
}

describe('differential tests against ngspice', () => {
  it('ngspice is installed (the differential tests must not be skipped)', () => {
    expect(existsSync(NGSPICE), `${NGSPICE} missing: install the Debian package ngspice (npm test does it)`).toBe(true);
  });

  it('a hand-checkable network agrees: R1 wye generator, line and load (Nilsson & Riedel Ex. 11.1 data)', () => {
    const prims: Primitive[] = [];
    (['a', 'b', 'c'] as const).forEach((p, k) => {
      prims.push({ type: 'voltageSource', id: `E${p}`, plus: `g.${p}`, minus: 'g.n', volts: polar(120, -120 * k), seriesOhms: { re: 0.2, im: 0.5 } });
      prims.push({ type: 'impedance', id: `L${p}`, from: `g.${p}`, to: `l.${p}`, ohms: { re: 0.8, im: 1.5 } });
      prims.push({ type: 'impedance', id: `Z${p}`, from: `l.${p}`, to: 'l.n', ohms: { re: 39, im: 28 } });
    });
    prims.push({ type: 'switch', id: 'N', from: 'g.n', to: 'l.n', closed: true }, { type: 'switch', id: 'GE', from: 'g.n', to: 'earth', closed: true });
    const sol = compare(prims, 'R1');
    // (V) Nilsson & Riedel Example 11.1: load VAN 115.225∠−1.193° V
    expect(cabs(sol.nodeVolts.get('l.a')!)).toBeCloseTo(115.225, 3);
  });

  it('a mutual-coupling-only branch and a complex admittance stamp agree', () => {
    const z: Cx[][] = [
      [{ re: 0.3, im: 0.9 }, { re: 0.05, im: 0.4 }],
      [{ re: 0.05, im: 0.4 }, { re: 0.25, im: 0.8 }],
    ];
    const prims: Primitive[] = [
      { type: 'voltageSource', id: 'V1', plus: 'a', minus: 'earth', volts: polar(230, 0) },
      { type: 'voltageSource', id: 'V2', plus: 'b', minus: 'earth', volts: polar(230, -120) },
      { type: 'coupledBranch', id: 'K', from: ['a', 'b'], to: ['a2', 'b2'], ohms: z },
      { type: 'impedance', id: 'R1', from: 'a2', to: 'earth', ohms: { re: 20, im: 5 } },
      { type: 'impedance', id: 'R2', from: 'b2', to: 'earth', ohms: { re: 15, im: -4 } },
      {
        type: 'admittanceMatrix',
        id: 'Y',
        nodes: ['a2', 'b2'],
        siemens: [
          [{ re: 0.02, im: 0.01 }, { re: -0.01, im: -0.005 }],
          [{ re: -0.01, im: -0.005 }, { re: 0.03, im: 0.02 }],
        ],
      },
      { type: 'currentSource', id: 'J', from: 'earth', to: 'b2', amps: polar(3, 45) },
    ];
    compare(prims, 'coupled');
  });

  // Dozens of seeded random networks; the seed is in the title so a failure reproduces.
  const seeds = Array.from({ length: 48 }, (_, k) => 1000 + 7919 * k);
  for (const seed of seeds) {
    const { features } = randomNetwork(seed);
    it(`random network seed ${seed}: ${features.join(', ')}`, () => {
      const { prims } = randomNetwork(seed);
      compare(prims, `seed ${seed}`);
    });
  }

  it('the random networks cover every feature the tests claim', () => {
    const all = new Set(seeds.flatMap((s) => randomNetwork(s).features));
    for (const f of [
      'open neutral',
      'load wye-floating',
      'load delta',
      'load wye-n',
      'earthing impedance',
      'coupled line',
      'current source',
      'series-impedance source',
      'floating island',
      'transformer stamp (unearthed delta secondary)',
      'source wye-unearthed',
      'source delta',
      'closed switch',
    ])
      expect(all.has(f), f).toBe(true);
  });
});
