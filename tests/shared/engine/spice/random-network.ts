/**
 * Seeded random four-wire networks of primitives for the differential tests against ngspice:
 * wye (earthed solidly / through an impedance / unearthed) or delta sources, coupled 4×4 line
 * sections, open neutrals, unbalanced wye loads with the star point on the neutral or floating,
 * delta and single-phase loads, earthing impedances, current sources, series-impedance sources,
 * separate floating parts, and transformer-like admittance stamps feeding an unearthed delta.
 */
import type { Cx, Primitive } from '../../../../shared/engine/types.ts';

/** mulberry32: a small, well-known 32-bit seeded PRNG (so failures reproduce from the printed seed). */
export function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const pol = (m: number, deg: number): Cx => ({ re: m * Math.cos((deg * Math.PI) / 180), im: m * Math.sin((deg * Math.PI) / 180) });

/** Options of the generator. */
export interface RandomNetworkOptions {
  buses?: number;
}

/** A random network and a description of its features (for test titles / failure messages). */
export function randomNetwork(seed: number, opts: RandomNetworkOptions = {}): { prims: Primitive[]; features: string[] } {
  const rnd = prng(seed);
  const between = (a: number, b: number) => a + (b - a) * rnd();
  const chance = (p: number) => rnd() < p;
  const pick = <T,>(xs: readonly T[]): T => xs[Math.floor(rnd() * xs.length)];
  const prims: Primitive[] = [];
  const features = new Set<string>();
  let id = 0;
  const nid = (p: string) => `${p}${++id}`;
  const phases = ['a', 'b', 'c'] as const;
  const zLoad = (): Cx => {
    const r = between(5, 60);
    const kind = rnd();
    // inductive, capacitive or resistive loads
    return { re: r, im: kind < 0.6 ? between(0, r) : kind < 0.8 ? -between(0.1, r) : 0 };
  };
  const nBuses = opts.buses ?? 2 + Math.floor(rnd() * 6);

  // --- source
  const vll = pick([208, 400, 480, 4160]);
  const vln = vll / Math.sqrt(3);
  const srcKind = pick(['wye-solid', 'wye-z', 'wye-unearthed', 'delta'] as const);
  features.add(`source ${srcKind}`);
  if (srcKind === 'delta') {
    // a delta of ideal sources is a loop: give each a series impedance
    const pairs = [['a', 'b', 30], ['b', 'c', -90], ['c', 'a', 150]] as const;
    for (const [p, m, ang] of pairs)
      prims.push({ type: 'voltageSource', id: nid('E'), plus: `s.${p}`, minus: `s.${m}`, volts: pol(vll * between(0.97, 1.03), ang + between(-3, 3)), seriesOhms: { re: between(0.01, 0.1), im: between(0.05, 0.5) } });
    // the delta source feeds a four-wire system through an earthed "neutral" made by an earthing impedance star
    for (const p of phases) prims.push({ type: 'impedance', id: nid('Zg'), from: `s.${p}`, to: 's.n', ohms: { re: between(50, 200), im: between(0, 100) } });
    prims.push({ type: 'switch', id: nid('SWg'), from: 's.n', to: 'earth', closed: true });
  } else {
    phases.forEach((p, k) => {
      const withZ = chance(0.6);
      prims.push({
        type: 'voltageSource',
        id: nid('E'),
        plus: `s.${p}`,
        minus: 's.n',
        volts: pol(vln * between(0.97, 1.03), -120 * k + between(-3, 3)),
        ...(withZ ? { seriesOhms: { re: between(0.01, 0.2), im: between(0.05, 0.6) } } : {}),
      });
      if (withZ) features.add('series-impedance source');
    });
    if (srcKind === 'wye-solid') prims.push({ type: 'switch', id: nid('SWg'), from: 's.n', to: 'earth', closed: true });
    if (srcKind === 'wye-z') prims.push({ type: 'impedance', id: nid('Zn'), from: 's.n', to: 'earth', ohms: { re: between(0.5, 20), im: between(0, 10) } });
  }

  // --- radial four-wire feeder
  const busName = (b: number) => (b === 0 ? 's' : `b${b}`);
  for (let b = 1; b <= nBuses; b++) {
    const up = busName(Math.floor(rnd() * b)); // radial: parent is any earlier bus
    const here = busName(b);
    const len = between(0.05, 0.5);
    const openNeutral = chance(0.15);
    const neutralEnd = openNeutral ? `${here}.nx` : `${here}.n`;
    if (chance(0.7)) {
      // coupled 4×4 section (phases a, b, c, neutral), symmetric, inductive self and mutual terms
      const z: Cx[][] = [];
      for (let i = 0; i < 4; i++) {
        z.push([]);
        for (let j = 0; j < 4; j++) z[i].push({ re: 0, im: 0 });
      }
      for (let i = 0; i < 4; i++) z[i][i] = { re: len * between(0.1, 0.6), im: len * between(0.6, 1.2) };
      for (let i = 0; i < 4; i++)
        for (let j = i + 1; j < 4; j++) {
          const m = { re: len * between(0, 0.1), im: len * between(0.1, 0.45) };
          z[i][j] = m;
          z[j][i] = m;
        }
      prims.push({ type: 'coupledBranch', id: nid('LN'), from: ['a', 'b', 'c', 'n'].map((c) => `${up}.${c}`), to: ['a', 'b', 'c'].map((c) => `${here}.${c}`).concat(neutralEnd), ohms: z });
      features.add('coupled line');
    } else {
      for (const c of ['a', 'b', 'c', 'n'])
        prims.push({ type: 'impedance', id: nid('LI'), from: `${up}.${c}`, to: c === 'n' ? neutralEnd : `${here}.${c}`, ohms: { re: len * between(0.1, 0.6), im: len * between(0.3, 1) } });
    }
    if (openNeutral) {
      prims.push({ type: 'switch', id: nid('SWn'), from: neutralEnd, to: `${here}.n`, closed: false });
      features.add('open neutral');
    } else if (chance(0.1)) {
      prims.push({ type: 'switch', id: nid('SWn'), from: `${here}.n`, to: `${here}.n2`, closed: true });
      prims.push({ type: 'impedance', id: nid('Zn2'), from: `${here}.n2`, to: 'earth', ohms: { re: between(5, 25), im: 0 } });
      features.add('closed switch');
    }
    if (chance(0.4)) {
      prims.push({ type: 'impedance', id: nid('Ze'), from: `${here}.n`, to: 'earth', ohms: { re: between(1, 25), im: between(0, 2) } });
      features.add('earthing impedance');
    }
    // loads
    const loadKind = pick(['wye-n', 'wye-floating', 'delta', 'single'] as const);
    features.add(`load ${loadKind}`);
    if (loadKind === 'wye-n' || loadKind === 'wye-floating') {
      const star = loadKind === 'wye-n' ? `${here}.n` : `${here}.star`;
      for (const p of phases) if (chance(0.9)) prims.push({ type: 'impedance', id: nid('ZL'), from: `${here}.${p}`, to: star, ohms: zLoad() });
    } else if (loadKind === 'delta') {
      for (const [p, q] of [['a', 'b'], ['b', 'c'], ['c', 'a']]) prims.push({ type: 'impedance', id: nid('ZD'), from: `${here}.${p}`, to: `${here}.${q}`, ohms: zLoad() });
    } else {
      const [p, q] = pick([['a', 'n'], ['b', 'n'], ['c', 'n'], ['a', 'b'], ['b', 'c']] as const);
      prims.push({ type: 'impedance', id: nid('ZS'), from: `${here}.${p}`, to: `${here}.${q}`, ohms: zLoad() });
    }
    if (chance(0.2)) {
      // from the bus neutral when it is surely connected, else from earth (a current source into an
      // isolated node would be ill-posed)
      const from = !openNeutral || loadKind === 'wye-n' ? `${here}.n` : 'earth';
      prims.push({ type: 'currentSource', id: nid('J'), from, to: `${here}.${pick(phases)}`, amps: pol(between(0.5, 5), between(-180, 180)) });
      features.add('current source');
    }
  }

  // --- a separate floating part: an unearthed wye source feeding a delta load
  if (chance(0.25)) {
    phases.forEach((p, k) =>
      prims.push({ type: 'voltageSource', id: nid('EF'), plus: `f.${p}`, minus: 'f.n', volts: pol(between(100, 130), -120 * k), seriesOhms: { re: 0.1, im: 0.3 } }),
    );
    for (const [p, q] of [['a', 'b'], ['b', 'c'], ['c', 'a']]) prims.push({ type: 'impedance', id: nid('ZFD'), from: `f.${p}`, to: `f.${q}`, ohms: zLoad() });
    features.add('floating island');
  }

  // --- transformer-like stamps: three single-phase units, wye primary on bus 1, unearthed delta secondary
  if (chance(0.25)) {
    const y = { re: between(0.5, 2), im: -between(2, 8) }; // leakage admittance
    const a = between(0.2, 0.6); // the stamp forces V_primary = a·V_secondary at no load
    const wind = [['a', 'd.a', 'd.b'], ['b', 'd.b', 'd.c'], ['c', 'd.c', 'd.a']] as const;
    for (const [p, s1, s2] of wind) {
      const v = [1, -1, -a, a];
      const siemens: Cx[][] = v.map((vi) => v.map((vj) => ({ re: y.re * vi * vj, im: y.im * vi * vj })));
      prims.push({ type: 'admittanceMatrix', id: nid('T'), nodes: [`b1.${p}`, 'b1.n', s1, s2], siemens });
    }
    for (const [p, q] of [['a', 'b'], ['b', 'c'], ['c', 'a']]) prims.push({ type: 'impedance', id: nid('ZTD'), from: `d.${p}`, to: `d.${q}`, ohms: zLoad() });
    features.add('transformer stamp (unearthed delta secondary)');
  }
  return { prims, features: [...features].sort() };
}
