/**
 * Seeded random circuits of building blocks for the block-level differential tests against
 * ngspice: wye or delta sources (ideal, per-phase ohms, sequence impedances, short-circuit level;
 * earthed solidly, through an impedance or not at all), lines of every data kind (Carson with and
 * without Kron reduction, matrix, sequence, per conductor; shunt capacitance; open conductors),
 * a transformer bank of a given vector group or North American connection with every earthing,
 * a centre-tapped transformer with its service, loads of every connection (ohms, R/L/C, kW at
 * constant impedance), capacitor banks, earth electrodes, faults and a multi-conductor switch.
 * Invented data; every generated value is within the physical range of its block.
 */
import type { CircuitInput } from '../../../../shared/engine/index.ts';
import { prng } from './random-network.ts';

/** Every realisable IEC vector group (odd clocks: one delta, one wye; even clocks: alike) and every North American connection. */
export const ALL_GROUPS: ({ vectorGroup: string } | { connection: string })[] = (() => {
  const out: ({ vectorGroup: string } | { connection: string })[] = [];
  for (const h of ['YN', 'Y', 'D'])
    for (const l of ['yn', 'y', 'd'])
      for (let c = 0; c < 12; c++) if ((c % 2 === 1) === ((h === 'D') !== (l === 'd'))) out.push({ vectorGroup: `${h}${l}${c}` });
  for (const c of ['Yg-Yg', 'Y-Y', 'D-Yg', 'Yg-D', 'Y-D', 'D-D', 'D-Y', 'Yg-Y', 'Y-Yg']) out.push({ connection: c });
  return out;
})();

const CARSON_WIRES = [
  { conductor: 'a', xFt: 0, yFt: 28, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
  { conductor: 'b', xFt: 2.5, yFt: 28, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
  { conductor: 'c', xFt: 7, yFt: 28, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
  { conductor: 'n', xFt: 4, yFt: 24, gmrFt: 0.00814, rOhmsPerMile: 0.592 },
];

/** A random block circuit exercising `group`, with the nominal voltages the test side needs. */
export function randomBlockCircuit(seed: number, group: (typeof ALL_GROUPS)[number]): { circuit: CircuitInput; nominalVLL: Map<string, number>; splitPhaseBuses: Set<string>; features: string[] } {
  const r = prng(seed);
  const between = (a: number, b: number) => a + (b - a) * r();
  const chance = (p: number) => r() < p;
  const pick = <T,>(xs: readonly T[]): T => xs[Math.floor(r() * xs.length)];
  const cz = (re: number, im: number) => ({ re, im });
  const features: string[] = [];
  const els: Record<string, unknown>[] = [];
  const nominal = new Map<string, number>();
  const split = new Set<string>();
  const kv = pick([12.47, 11, 4.16, 13.8]);
  nominal.set('B0', kv * 1000);
  nominal.set('B1', kv * 1000);

  // --- source
  const delta = chance(0.35);
  const impKind = pick(['none', 'ohms', 'seq', 'mva'] as const);
  const impedance =
    impKind === 'ohms' ? { ohms: cz(between(0.05, 0.5), between(0.5, 3)) }
    : impKind === 'seq' ? { z1: cz(between(0.1, 0.5), between(1, 3)), z0: cz(between(0.1, 0.8), between(0.5, 4)) }
    : impKind === 'mva' ? { shortCircuitMva: between(50, 500), xOverR: between(3, 15), z0OverZ1: between(0.5, 2) }
    : undefined;
  const src: Record<string, unknown> = { type: 'source', id: 'SRC', bus: 'B0', kvLL: kv, angleDeg: between(-180, 180), connection: delta ? 'delta' : 'wye', ...(impedance ? { impedance } : {}) };
  if (!delta) {
    src.earthing = pick(['solid', { ohms: cz(between(1, 20), between(0, 5)) }, 'unearthed', undefined]);
    if (chance(0.3)) src.phases = { b: { pu: between(0.95, 1.05) }, c: { pu: between(0.95, 1.05), angleDeg: between(100, 140) } };
  }
  features.push(`source ${delta ? 'delta' : `wye ${typeof src.earthing === 'object' ? 'impedance-earthed' : (src.earthing ?? 'solid')}`} ${impKind}`);
  els.push(src);

  // --- HV line
  const lineKind = pick(['carson', 'carson-kron', 'matrix', 'sequence', 'perConductor'] as const);
  const unit = pick(['km', 'mi', 'ft', 'm'] as const);
  const length = { km: between(0.3, 3), mi: between(0.2, 2), ft: between(500, 8000), m: between(300, 3000) }[unit];
  const perKmScale = { km: 1, mi: 1.609344, ft: 0.0003048, m: 0.001 }[unit];
  let lineImp: Record<string, unknown>;
  let lineConductors = ['a', 'b', 'c', 'n'];
  if (lineKind === 'carson' || lineKind === 'carson-kron') {
    lineImp = { kind: 'carson', earthResistivityOhmM: pick([100, 30, 1000]), kronReduceNeutral: lineKind === 'carson-kron', conductors: CARSON_WIRES.map((w) => ({ ...w, yFt: w.yFt + between(-1, 1) })) };
    if (lineKind === 'carson-kron') lineConductors = ['a', 'b', 'c'];
  } else if (lineKind === 'matrix') {
    const zs = () => cz(between(0.2, 0.5) * perKmScale, between(0.6, 1.0) * perKmScale);
    const zm = () => cz(between(0.02, 0.06) * perKmScale, between(0.15, 0.3) * perKmScale);
    const m = [[zs(), zm(), zm(), zm()], [null, zs(), zm(), zm()], [null, null, zs(), zm()], [null, null, null, zs()]];
    for (let i = 0; i < 4; i++) for (let j = 0; j < i; j++) m[i][j] = m[j][i];
    lineImp = { kind: 'matrix', conductors: lineConductors, ohmsPerLength: m };
  } else if (lineKind === 'sequence') {
    lineImp = { kind: 'sequence', z1PerLength: cz(0.2 * perKmScale, 0.4 * perKmScale), z0PerLength: cz(0.6 * perKmScale, 1.3 * perKmScale), neutralOhmsPerLength: cz(0.5 * perKmScale, 0.9 * perKmScale) };
  } else {
    lineImp = { kind: 'perConductor', ohmsPerLength: { a: cz(0.3, 0.8), b: cz(0.31, 0.79), c: cz(0.29, 0.81), n: cz(0.5, 0.9) } };
  }
  const l1: Record<string, unknown> = { type: 'line', id: 'L1', from: 'B0', to: 'B1', length, lengthUnit: unit, impedance: lineImp };
  if (chance(0.25)) {
    l1.open = [pick(lineConductors.filter((c) => c !== 'a'))];
    features.push(`HV line open ${(l1.open as string[])[0]}`);
  }
  if (lineKind !== 'carson-kron' && chance(0.3)) {
    // capacitive shunt (S per length): B_ii > 0, B_ij < 0, diagonally dominant
    const nC = lineConductors.length;
    const b = Array.from({ length: nC }, (_, i) => Array.from({ length: nC }, (_, j) => (i === j ? 0 : -between(0.5e-6, 1.5e-6) / perKmScale)));
    for (let i = 0; i < nC; i++) for (let j = 0; j < i; j++) b[i][j] = b[j][i];
    const y = b.map((row, i) => row.map((v, j) => cz(0, i === j ? between(4e-6, 6e-6) / perKmScale : v)));
    l1.shunt = { siemensPerLength: y };
    features.push('line shunt');
  }
  features.push(`HV line ${lineKind} (${unit})`);
  els.push(l1);
  if (lineKind !== 'carson-kron' && chance(0.6)) els.push({ type: 'earthing', id: 'E1', node: 'B1.n', ohms: cz(between(2, 30), between(0, 2)) });
  if (chance(0.3)) {
    els.push({ type: 'capacitorBank', id: 'CAP', bus: 'B1', kvar: between(100, 600), connection: pick(['wye', 'wyeFloating', 'delta']), ...(chance(0.5) ? { kvLL: kv } : {}) });
    features.push('capacitor bank');
  }

  // --- centre-tapped transformer and its service
  if (chance(0.45)) {
    const primary = lineConductors.includes('n') && chance(0.6) ? ['b', 'n'] : ['a', 'c'];
    els.push({
      type: 'splitPhaseTransformer', id: 'SPT', from: 'B1', primary, to: 'S', kva: pick([25, 50, 100]),
      kvHigh: primary[1] === 'n' ? kv / Math.sqrt(3) : kv, lowVolts: 240,
      ...(chance(0.5) ? { percentR: between(0.8, 1.6), percentX: between(1.5, 3) } : { percentZ: between(1.5, 3), xOverR: between(1.5, 3) }),
      ...(chance(0.3) ? { lvEarthing: pick([{ ohms: 5 }, 'unearthed']) } : {}),
    });
    nominal.set('S', 240);
    split.add('S');
    els.push({ type: 'load', id: 'S1', bus: 'S', connection: 'single', between: ['1', 'n'], each: { kw: between(2, 8), kvar: between(0, 3) } });
    els.push({ type: 'load', id: 'S2', bus: 'S', connection: 'single', between: ['n', '2'], each: { ohms: cz(between(4, 12), between(0, 4)) } });
    els.push({ type: 'load', id: 'S12', bus: 'S', connection: 'single', between: ['1', '2'], each: { rOhms: between(10, 30), lHenry: between(0.001, 0.02), arrangement: pick(['series', 'parallel']) } });
    features.push(`centre-tapped transformer on ${primary.join('-')}`);
  }

  // --- the bank
  const isIec = 'vectorGroup' in group;
  const name = isIec ? group.vectorGroup : group.connection;
  const hvWye = isIec ? !group.vectorGroup.startsWith('D') : !group.connection.startsWith('D');
  const lvWye = isIec ? !/d\d+$/.test(group.vectorGroup) : !group.connection.endsWith('-D');
  const lvKv = pick([0.48, 0.416, 0.208, kv >= 11 ? 4.16 : 0.6]);
  nominal.set('B2', lvKv * 1000);
  nominal.set('B3', lvKv * 1000);
  nominal.set('B4', lvKv * 1000);
  const tx: Record<string, unknown> = {
    type: 'transformer', id: 'TX', from: 'B1', to: 'B2', kva: pick([150, 500, 1000]), kvHigh: kv, kvLow: lvKv, ...group,
    ...(chance(0.5) ? { percentR: between(0.5, 2), percentX: between(3, 7) } : { percentZ: between(4, 7), xOverR: between(3, 10) }),
  };
  const earthings = ['solid', 'unearthed', { ohms: cz(between(1, 10), between(0, 3)) }];
  if (hvWye && chance(0.5)) tx.hvEarthing = pick(earthings);
  if (lvWye && chance(0.5)) tx.lvEarthing = pick(earthings);
  // An HV tap on seeds ≡ 1, 2 (mod 3), chosen from the seed so the generator's draws (and so every circuit) stay as they were.
  if (seed % 3 !== 0) tx.tap = { steps: seed % 3 === 1 ? 2 : -3, stepPercent: seed % 3 === 1 ? 2.5 : 1.25 };
  const tapText = tx.tap ? ` tap ${JSON.stringify(tx.tap)}` : '';
  features.push(`bank ${name}${tx.hvEarthing ? ` HV ${JSON.stringify(tx.hvEarthing)}` : ''}${tx.lvEarthing ? ` LV ${JSON.stringify(tx.lvEarthing)}` : ''}${tapText}`);
  els.push(tx);

  // --- LV feeder and loads
  const lvBus = chance(0.7) ? 'B3' : 'B2';
  if (lvBus === 'B3') {
    const l2: Record<string, unknown> = {
      type: 'line', id: 'L2', from: 'B2', to: 'B3', length: between(20, 200), lengthUnit: 'm',
      impedance: chance(0.5)
        ? { kind: 'perConductor', ohmsPerLength: { a: cz(3e-4, 1e-4), b: cz(3e-4, 1e-4), c: cz(3e-4, 1e-4), n: cz(4e-4, 1e-4) } }
        : { kind: 'matrix', conductors: ['a', 'b', 'c', 'n'], ohmsPerLength: [0, 1, 2, 3].map((i) => [0, 1, 2, 3].map((j) => (i === j ? cz(3e-4, 3e-4) : cz(5e-5, 1e-4)))) },
    };
    if (chance(0.3)) {
      l2.open = [pick(['n', 'b'])];
      features.push(`LV line open ${(l2.open as string[])[0]}`);
    }
    els.push(l2);
  }
  type Spec = { ohms?: { re: number; im: number }; rOhms?: number; lHenry?: number; cFarad?: number; kw?: number; kvar?: number; arrangement?: string };
  const spec = (): Spec =>
    pick<Spec>([
      { kw: between(5, 50), kvar: between(-5, 20) },
      { ohms: cz(between(2, 20), between(-3, 8)) },
      { rOhms: between(3, 20), lHenry: between(0.001, 0.02), cFarad: chance(0.3) ? between(1e-4, 1e-3) : undefined, arrangement: pick(['series', 'parallel']) },
    ]);
  const scaleSpec = (s: Spec): Spec => {
    // keep the load in proportion to the LV voltage (4.16 kV loads draw more)
    if (s.ohms && lvKv > 1) return { ohms: cz(s.ohms.re * 40, s.ohms.im * 40) };
    if (s.rOhms !== undefined && lvKv > 1) return { ...s, rOhms: s.rOhms * 40, lHenry: s.lHenry! * 40, ...(s.cFarad ? { cFarad: s.cFarad / 40 } : {}) };
    return s;
  };
  const wyeConn = pick(['wye', 'wyeFloating'] as const);
  els.push({ type: 'load', id: 'LY', bus: lvBus, connection: wyeConn, phases: { a: scaleSpec(spec()), b: scaleSpec(spec()), c: scaleSpec(spec()) } });
  els.push({ type: 'load', id: 'LD', bus: lvBus, connection: 'delta', ...(chance(0.5) ? { total: { kw: between(20, 100), kvar: between(0, 30) } } : { each: scaleSpec(spec()) }) });
  if (chance(0.5)) els.push({ type: 'load', id: 'L1P', bus: lvBus, connection: 'single', between: pick([['a', 'n'], ['b', 'c'], ['c', 'n']]), each: scaleSpec(spec()) });
  features.push(`loads ${wyeConn}`);
  if (chance(0.5)) els.push({ type: 'earthing', id: 'E3', node: `${lvBus}.n`, ohms: cz(between(2, 30), 0) });
  if (chance(0.3)) {
    els.push({ type: 'switch3', id: 'SW', from: lvBus, to: 'B4', ...(chance(0.5) ? { open: [pick(['n', 'c'])] } : {}) });
    els.push({ type: 'load', id: 'L4', bus: 'B4', connection: 'wye', each: scaleSpec({ ohms: cz(between(5, 15), between(1, 5)) }) });
    features.push('switch3');
  }
  if (chance(0.25)) {
    const kind = pick(['lineEarth', 'lineLine', 'doubleLineEarth', 'threePhase', 'threePhaseEarth'] as const);
    els.push({ type: 'fault', id: 'F', bus: lvBus, kind, ohms: pick([0, between(0.05, 2)]), ...(kind.endsWith('Earth') && kind !== 'lineEarth' ? { earthOhms: between(0.1, 3) } : {}) });
    features.push(`fault ${kind}`);
  }
  const circuit = { format: 'wyeward-circuit', version: 1, frequencyHz: pick([50, 60]), sequence: pick(['ABC', 'ACB']), elements: els } as unknown as CircuitInput;
  features.push(circuit.sequence!);
  return { circuit, nominalVLL: nominal, splitPhaseBuses: split, features };
}
