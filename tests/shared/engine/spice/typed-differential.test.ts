/**
 * The typed path of primitive-only files (shared/engine/typed: the CLI's `--json` path) against
 * ngspice (`ngspice -b`, AC at the file's frequency), as ngspice-differential.test.ts checks the
 * general solver: every node voltage to 1e-6 of the largest node voltage, and the currents of the
 * ideal sources (recovered by KCL along the supernode trees) to 1e-6 of the largest such current. Seeded files of every shape the typed path takes (source trees off earth,
 * a source between feeder nodes, current sources, both sequences) and the primitive-only
 * benchmark feeder. Fails — does not skip — when ngspice is missing.
 */
import { existsSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { prepareCircuit, printedPrimitiveResultOfText } from '../../../../shared/engine/index.ts';
import { primitiveFeeder } from '../../../bench/primitive-feeder.ts';
import { typedFeeder, typedFeederText } from '../typed/typed-feeder.ts';
import { NGSPICE, spiceSolve } from './netlist.ts';

const REL = 1e-6;

function compare(text: string, label: string) {
  const typed = printedPrimitiveResultOfText(text);
  expect(typed, `${label}: declined by the typed path`).toBeDefined();
  const file = JSON.parse(text) as { frequencyHz: number };
  const spice = spiceSolve(prepareCircuit(file).primitives, file.frequencyHz);
  const index = new Map(typed!.nodeNames.map((n, i) => [n, i]));
  let vmax = 0;
  for (const v of spice.nodeVolts.values()) vmax = Math.max(vmax, Math.hypot(v.re, v.im));
  let worst = 0;
  let worstNode = '';
  for (const [node, vs] of spice.nodeVolts) {
    const i = index.get(node);
    expect(i, `${label}: node '${node}' missing`).toBeDefined();
    const d = Math.hypot(typed!.vRe[i!] - vs.re, typed!.vIm[i!] - vs.im);
    if (d > worst) [worst, worstNode] = [d, node];
  }
  expect(worst / vmax, `${label}: node '${worstNode}' differs by ${worst} V (largest ${vmax} V)`).toBeLessThanOrEqual(REL);
  let imax = 0;
  for (const c of spice.currents.values()) imax = Math.max(imax, Math.hypot(c.re, c.im));
  expect(spice.currents.size).toBeGreaterThan(0);
  const k = new Map(typed!.elementIds.map((id, j) => [id, j]));
  for (const [id, is] of spice.currents) {
    const at = typed!.currentStart[k.get(id)!];
    const d = Math.hypot(typed!.cRe[at] - is.re, typed!.cIm[at] - is.im);
    expect(d, `${label}: current of '${id}' ${typed!.cRe[at]} + j${typed!.cIm[at]} vs ngspice ${is.re} + j${is.im}`).toBeLessThanOrEqual(REL * Math.max(imax, 1e-9));
  }
}

describe('typed path against ngspice', () => {
  it('ngspice is installed (the differential tests must not be skipped)', () => {
    expect(existsSync(NGSPICE), `${NGSPICE} missing: install the Debian package ngspice`).toBe(true);
  });
  for (let seed = 300; seed < 324; seed++) {
    it(`seeded typed-path file ${seed}`, () => compare(typedFeederText(typedFeeder(seed, { shuffleKeys: true }), seed), `seed ${seed}`));
  }
  it('the primitive-only benchmark feeder (150 buses)', () => compare(JSON.stringify(primitiveFeeder(150, 3)), 'feeder'));
});
