/**
 * Block-level differential tests against ngspice: each building block is written as a SPICE AC
 * netlist from its own parameters (./block-netlist.ts — ideal cores by controlled sources, Carson
 * lines as coupled inductors, physical delta sources, R/L/C loads), never from the engine's
 * expansion, and every bus-conductor voltage and every block terminal current must agree with
 * the engine to 1e-6 relative per quantity, with a floor of 1e-9 of the largest value of its kind
 * in that circuit. Seeded random combinations (two per group, 126) cover every realisable IEC
 * vector group and every North American connection, both phase sequences, earthed and unearthed neutrals, open
 * conductors. The test side's own transformer wiring is first checked against the definition of
 * the clock number (its phase shift measured by ngspice), so that a wrong wiring cannot hide.
 */
import { existsSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { solveCircuit, type CircuitInput, type CircuitResult, type Cx } from '../../../../shared/engine/index.ts';
import { NGSPICE, runNgspice } from './netlist.ts';
import { parseGroup } from './bank-wiring.ts';
import { writeBlocks } from './block-netlist.ts';
import { probeKey, SpiceBuilder } from './spice-builder.ts';
import { ALL_GROUPS, randomBlockCircuit } from './random-block-circuit.ts';

const REL = 1e-6;
const FLOOR = 1e-9;
const mag = (c: Cx) => Math.hypot(c.re, c.im);
const isBusNode = (n: string) => n.includes('.') && !n.includes('#') && !n.includes('/');

/** Solve with the engine and with ngspice; compare every bus node voltage and every terminal current. */
function compareBlocks(circuit: CircuitInput, nominalVLL: Map<string, number>, splitPhaseBuses: Set<string>, label: string): CircuitResult {
  const res = solveCircuit(circuit, { solver: { tolerance: 1e-12 } });
  // A floating part (galvanically, or only numerically: e.g. the zero-sequence voltage behind a
  // bank whose other side has no zero-sequence path, which no element of the model fixes) is
  // solved by the engine with a reference node held at 0 V; ngspice gets the same reference.
  const refs = res.floating.map((f) => f.referenceNode);
  const b = new SpiceBuilder(circuit.frequencyHz);
  writeBlocks(b, circuit, { nominalVLL, splitPhaseBuses });
  const text = b.text(refs);
  const { vectors } = runNgspice(text);
  for (const r of refs) expect(b.nodeName.has(r), `${label}: the engine's reference node ${r} has no SPICE counterpart`).toBe(true);
  // voltages
  const vs: [string, Cx][] = [];
  for (const [ours, theirs] of b.nodeName) {
    if (!isBusNode(ours)) continue;
    const v = theirs === '0' ? { re: 0, im: 0 } : vectors.get(`v(${theirs})`);
    expect(v, `${label}: ngspice has no voltage for ${ours}`).toBeDefined();
    vs.push([ours, v!]);
  }
  for (const n of Object.keys(res.nodes)) if (isBusNode(n)) expect(b.nodeName.has(n), `${label}: engine node ${n} has no SPICE counterpart`).toBe(true);
  const vmax = Math.max(...vs.map(([, v]) => mag(v)));
  for (const [n, v] of vs) {
    const e = res.nodes[n];
    expect(e, `${label}: node ${n} missing from the engine's result`).toBeDefined();
    const d = mag({ re: e.re - v.re, im: e.im - v.im });
    expect(d, `${label}: V(${n}) engine ${e.re} + j${e.im}, ngspice ${v.re} + j${v.im}`).toBeLessThanOrEqual(Math.max(REL * mag(v), FLOOR * vmax));
  }
  // currents at every block terminal (into the block; sources report out of it)
  const spiceI = new Map<string, Cx>();
  for (const [key, src] of b.probes) spiceI.set(key, vectors.get(`i(${src.toLowerCase()})`)!);
  const imax = Math.max(...[...spiceI.values()].map(mag));
  const seen = new Set<string>();
  for (const el of Object.values(res.elements)) {
    const sign = el.currentDirection === 'out-of-element' ? -1 : 1;
    for (const port of el.ports ?? []) {
      port.conductors.forEach((c, k) => {
        const key = probeKey(el.id, port.bus ?? 'node', c);
        const ours = { re: sign * port.currents[k].re, im: sign * port.currents[k].im };
        const theirs = spiceI.get(key);
        if (theirs === undefined) {
          // a conductor the block does not use (an open conductor, an unfaulted phase): no current
          expect(mag(ours), `${label}: current ${key} should be zero`).toBeLessThanOrEqual(FLOOR * imax);
          return;
        }
        seen.add(key);
        const d = mag({ re: ours.re - theirs.re, im: ours.im - theirs.im });
        expect(d, `${label}: I(${key}) engine ${ours.re} + j${ours.im}, ngspice ${theirs.re} + j${theirs.im}`).toBeLessThanOrEqual(Math.max(REL * mag(theirs), FLOOR * imax));
      });
    }
  }
  for (const key of spiceI.keys()) expect(seen.has(key), `${label}: engine reports no current for terminal ${key}`).toBe(true);
  return res;
}

describe('block-level differential tests against ngspice', () => {
  it('ngspice is installed (the differential tests must not be skipped)', () => {
    expect(existsSync(NGSPICE), `${NGSPICE} missing: install the Debian package ngspice (npm test does it)`).toBe(true);
  });

  it("the test side's bank wiring gives the clock-number shift for every group and both sequences (ngspice alone)", () => {
    // (V) IEC 60076-1: LV lags HV by clock × 30° (ABC); (M) the same physical wiring under ACB
    // rotation shows the opposite displacement. No-load: an ideal source and a light delta load.
    const b = new SpiceBuilder(60);
    const cases: { label: string; hvAB: string; lvAB: string; expectDeg: number; ratio: number; floating: boolean; hvStar?: string }[] = [];
    ALL_GROUPS.forEach((g, k) => {
      for (const seq of ['ABC', 'ACB'] as const) {
        const hv = `H${k}${seq}`;
        const lv = `L${k}${seq}`;
        const circuit = {
          format: 'wyeward-circuit', version: 1, frequencyHz: 60, sequence: seq,
          elements: [
            { type: 'source', id: `S${hv}`, bus: hv, kvLL: 11, angleDeg: 10 },
            { type: 'transformer', id: `T${hv}`, from: hv, to: lv, kva: 500, kvHigh: 11, kvLow: 0.4, ...g, percentR: 1, percentX: 5 },
            { type: 'load', id: `R${hv}`, bus: lv, connection: 'delta', each: { ohms: 1e6 } },
          ],
        } as unknown as CircuitInput;
        writeBlocks(b, circuit, { nominalVLL: new Map(), splitPhaseBuses: new Set() });
        const clock = parseGroup(g).clock;
        cases.push({ label: `${JSON.stringify(g)} ${seq}`, hvAB: hv, lvAB: lv, expectDeg: (seq === 'ABC' ? -30 : 30) * clock, ratio: 0.4 / 11, floating: !parseGroup(g).lvN, hvStar: parseGroup(g).hv === 'Y' && !parseGroup(g).hvN ? `T${hv}#hvStar` : undefined });
      }
    });
    // LV delta and unearthed wye sides float: tie one LV conductor of each to ground
    // (and an unearthed HV star, whose zero-sequence voltage nothing fixes when the LV side has
    // no zero-sequence path: balanced, it sits at earth potential anyway)
    const refs = cases.flatMap((c) => [...(c.floating ? [`${c.lvAB}.c`] : []), ...(c.hvStar ? [c.hvStar] : [])]);
    const { vectors } = runNgspice(b.text(refs));
    const v = (n: string) => vectors.get(`v(${b.nodeName.get(n)})`) ?? { re: 0, im: 0 };
    for (const c of cases) {
      const vab = (bus: string) => {
        const a = v(`${bus}.a`);
        const bb = v(`${bus}.b`);
        return { re: a.re - bb.re, im: a.im - bb.im };
      };
      const h = vab(c.hvAB);
      const l = vab(c.lvAB);
      const shift = (((Math.atan2(l.im, l.re) - Math.atan2(h.im, h.re)) * 180) / Math.PI + 540) % 360 - 180;
      const want = ((c.expectDeg % 360) + 540) % 360 - 180;
      expect(Math.abs(((shift - want + 540) % 360) - 180), `${c.label}: shift ${shift}°, want ${want}°`).toBeLessThan(0.01);
      expect(mag(l) / mag(h)).toBeCloseTo(c.ratio, 4);
    }
  });

  // two circuits per group (126): the other blocks, earthings and sequence vary between them
  [...ALL_GROUPS, ...ALL_GROUPS].forEach((g, k) => {
    const seed = 4000 + 7919 * k;
    const { features } = randomBlockCircuit(seed, g);
    it(`seed ${seed}: ${features.join(', ')}`, () => {
      const { circuit, nominalVLL, splitPhaseBuses } = randomBlockCircuit(seed, g);
      compareBlocks(circuit, nominalVLL, splitPhaseBuses, `seed ${seed}`);
    });
  });

  it('the random block circuits cover every feature the tests claim', () => {
    const all = [...ALL_GROUPS, ...ALL_GROUPS].flatMap((g, k) => randomBlockCircuit(4000 + 7919 * k, g).features).join(' | ');
    for (const f of [
      /source delta ohms/,
      /source delta (seq|mva)/,
      /source delta none/,
      /source wye solid/,
      /source wye unearthed/,
      /source wye impedance-earthed/,
      /HV line carson \(/,
      /HV line carson-kron/,
      /HV line matrix/,
      /HV line sequence/,
      /HV line perConductor/,
      /HV line open n/,
      /LV line open [nb]/,
      /line shunt/,
      /centre-tapped transformer on b-n/,
      /centre-tapped transformer on a-c/,
      /capacitor bank/,
      /tap \{"steps":2,"stepPercent":2.5\}/,
      /tap \{"steps":-3,"stepPercent":1.25\}/,
      /HV "unearthed"/,
      /LV "unearthed"/,
      /LV \{"ohms"/,
      /loads wyeFloating/,
      /switch3/,
      /fault lineEarth/,
      /fault threePhase/,
      /ACB/,
      /ABC/,
    ])
      expect(all, String(f)).toMatch(f);
  });
});
