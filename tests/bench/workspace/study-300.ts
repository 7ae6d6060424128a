/**
 * A 300-element study in the engine's circuit format, shaped like what the workspace canvas
 * produces: a 12.47 kV four-wire feeder of Carson-modelled sections (main line and laterals),
 * three-phase and single-phase loads along it, D-Yg service banks with 208Y/120 V services,
 * canvas-style `switch3` connections (one per service, neutral closed) and earth electrodes.
 * Seeded, so every run solves the same study. Invented data.
 */
import type { CircuitInput, CircuitElementInput } from '../../../shared/engine/index.ts';

/** Small seeded PRNG (LCG, Numerical Recipes constants) so the study is the same in every run. */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

const geometry = {
  kind: 'carson' as const,
  earthResistivityOhmM: 100,
  conductors: [
    { conductor: 'a' as const, xFt: 0, yFt: 29, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
    { conductor: 'b' as const, xFt: 2.5, yFt: 29, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
    { conductor: 'c' as const, xFt: 7, yFt: 29, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
    { conductor: 'n' as const, xFt: 4, yFt: 25, gmrFt: 0.00814, rOhmsPerMile: 0.592 },
  ],
};

const service = { kind: 'perConductor' as const, ohmsPerLength: { a: { re: 0.00054, im: 0.0003 }, b: { re: 0.00054, im: 0.0003 }, c: { re: 0.00054, im: 0.0003 }, n: { re: 0.00054, im: 0.0003 } } };

/** The study with exactly `target` elements (default 300). */
export function study300(target = 300, seed = 7): CircuitInput {
  const rnd = lcg(seed);
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rnd() * xs.length)];
  const els: CircuitElementInput[] = [{ type: 'source', id: 'SUB', bus: 'F0', kvLL: 12.47, impedance: { shortCircuitMva: 150, xOverR: 8, z0OverZ1: 1.5 } }];
  const buses = ['F0'];
  let k = 0;
  const room = () => target - els.length;
  while (room() > 0) {
    k++;
    const parent = buses[Math.max(0, buses.length - 1 - Math.floor(rnd() * 3))];
    const bus = `F${k}`;
    els.push({ type: 'line', id: `SEC${k}`, from: parent, to: bus, length: 0.05 + 0.2 * rnd(), lengthUnit: 'mi', impedance: geometry });
    buses.push(bus);
    if (room() <= 0) break;
    const kind = rnd();
    if (kind < 0.4) {
      els.push({ type: 'load', id: `L${k}`, bus, connection: 'wye', phases: { a: { kw: 20 + 80 * rnd(), kvar: 10 * rnd() }, b: { kw: 20 + 80 * rnd(), kvar: 10 * rnd() }, c: { kw: 20 + 80 * rnd(), kvar: 10 * rnd() } } });
    } else if (kind < 0.7) {
      const p = pick(['a', 'b', 'c'] as const);
      els.push({ type: 'load', id: `L${k}`, bus, connection: 'single', between: [p, 'n'], each: { kw: 10 + 40 * rnd(), kvar: 5 * rnd() } });
    } else if (room() >= 6) {
      // A service bank with its drop behind a canvas-style connection switch and three house loads.
      const lv = `S${k}`;
      const drop = `H${k}`;
      els.push({ type: 'transformer', id: `T${k}`, from: bus, to: lv, kva: 75, kvHigh: 12.47, kvLow: 0.208, connection: 'D-Yg', percentZ: 3, xOverR: 3 });
      els.push({ type: 'switch3', id: `W${k}`, from: lv, to: `${lv}X`, open: [] });
      els.push({ type: 'line', id: `D${k}`, from: `${lv}X`, to: drop, length: 20 + 40 * rnd(), lengthUnit: 'm', impedance: service });
      for (const p of ['a', 'b', 'c'] as const) els.push({ type: 'load', id: `H${k}${p}`, bus: drop, connection: 'single', between: [p, 'n'], each: { kw: 0.5 + 5 * rnd(), kvar: 0.5 * rnd() } });
    }
    if (k % 5 === 0 && room() > 0) els.push({ type: 'earthing', id: `E${k}`, node: `${bus}.n`, ohms: 5 + 20 * rnd() });
  }
  return { format: 'wyeward-circuit', version: 1, frequencyHz: 60, name: 'Bench: Harrowgate feeder, 300 elements', elements: els.slice(0, target) };
}

/** The same study with one load changed (what a property edit sends), `step` making each edit distinct. */
export function editedStudy(base: CircuitInput, step: number): CircuitInput {
  const i = base.elements.findIndex((e) => e.type === 'load' && (e as { connection?: string }).connection === 'single');
  const elements = base.elements.slice();
  elements[i] = { ...(elements[i] as object), each: { kw: 10 + (step % 17), kvar: 1 } } as CircuitElementInput;
  return { ...base, elements };
}
