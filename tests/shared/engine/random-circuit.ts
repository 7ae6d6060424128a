/**
 * Seeded random circuits built from building blocks (sources, lines of every data kind, banks of
 * every realisable vector group, unbalanced loads, capacitor banks, open conductors, faults). Invented data.
 */
import type { CircuitInput } from '../../../shared/engine/index.ts';

/** Small deterministic PRNG (mulberry32). */
function rng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const GROUPS = ['YNyn0', 'Dyn1', 'Dyn11', 'YNd1', 'YNd11', 'Dd0', 'Yyn0', 'Dyn5', 'YNd7'];
const NA = ['Yg-Yg', 'D-Yg', 'Yg-D', 'D-D', 'Y-Y', 'D-Y'];

/** A random circuit of building blocks for `seed`. */
export function randomCircuit(seed: number): CircuitInput {
  const r = rng(seed);
  const pick = <T,>(xs: readonly T[]): T => xs[Math.floor(r() * xs.length)];
  const between = (a: number, b: number) => a + (b - a) * r();
  const els: object[] = [];
  const kv = pick([12.47, 11, 4.16]);
  const impedance = pick([
    undefined,
    { ohms: { re: between(0.05, 0.5), im: between(0.5, 3) } },
    { z1: { re: between(0.1, 0.5), im: between(1, 3) }, z0: { re: between(0.1, 0.8), im: between(0.5, 4) } },
    { shortCircuitMva: between(50, 500), xOverR: between(3, 15), z0OverZ1: between(0.5, 2) },
  ]);
  els.push({ type: 'source', id: 'SRC', bus: 'B0', kvLL: kv, ...(impedance ? { impedance } : {}), angleDeg: between(-180, 180), earthing: pick(['solid', { ohms: between(1, 20) }]) });
  const lineData = () =>
    pick([
      { kind: 'perConductor', ohmsPerLength: { a: { re: 0.3, im: 0.8 }, b: { re: 0.3, im: 0.8 }, c: { re: 0.3, im: 0.8 }, n: { re: 0.5, im: 0.9 } } },
      { kind: 'sequence', z1PerLength: { re: 0.2, im: 0.4 }, z0PerLength: { re: 0.6, im: 1.3 }, neutralOhmsPerLength: { re: 0.5, im: 0.9 } },
      { kind: 'carson', conductors: [
        { conductor: 'a', xFt: 0, yFt: 29, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
        { conductor: 'b', xFt: 2.5, yFt: 29, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
        { conductor: 'c', xFt: 7, yFt: 29, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
        { conductor: 'n', xFt: 4, yFt: 25, gmrFt: 0.00814, rOhmsPerMile: 0.592 },
      ] },
    ]);
  els.push({ type: 'line', id: 'L1', from: 'B0', to: 'B1', length: between(0.2, 3), impedance: lineData() });
  els.push({ type: 'earthing', id: 'E1', node: 'B1.n', ohms: between(2, 30) });
  const useIec = r() < 0.6;
  const group = useIec ? pick(GROUPS) : pick(NA);
  const lvKv = pick([0.48, 0.416, 0.208]);
  els.push({ type: 'transformer', id: 'TX', from: 'B1', to: 'B2', kva: pick([150, 500, 1000]), kvHigh: kv, kvLow: lvKv, ...(useIec ? { vectorGroup: group } : { connection: group }), percentR: between(0.5, 2), percentX: between(3, 7), ...(seed % 2 === 0 ? { tap: { steps: (seed % 5) - 2, stepPercent: 2.5 } } : {}) }); // a tap on every other seed, drawn without the generator so the circuits stay as they were
  const lvDelta = /d\d+$/.test(group) || group.endsWith('-D');
  if (lvDelta) els.push({ type: 'earthing', id: 'E2', node: 'B2.a', ohms: 1000 }); // a high-resistance earth on the delta side
  els.push({ type: 'line', id: 'L2', from: 'B2', to: 'B3', length: between(20, 200), lengthUnit: 'm', impedance: { kind: 'perConductor', ohmsPerLength: { a: 3e-4, b: 3e-4, c: 3e-4, n: 3e-4 } }, open: r() < 0.3 ? [pick(['n', 'b'])] : [] });
  const spec = () => pick([{ kw: between(5, 50), kvar: between(0, 20) }, { ohms: { re: between(2, 20), im: between(-3, 8) } }, { kw: between(5, 40), kvar: between(1, 10), model: pick(['current', 'power']) }]);
  els.push({ type: 'load', id: 'LY', bus: 'B3', connection: pick(['wye', 'wyeFloating']), phases: { a: spec(), b: spec(), c: spec() } });
  els.push({ type: 'load', id: 'LD', bus: 'B3', connection: 'delta', each: spec() });
  if (r() < 0.5) els.push({ type: 'capacitorBank', id: 'CAP', bus: 'B1', kvar: between(100, 600), connection: pick(['wye', 'delta']) });
  if (r() < 0.3) els.push({ type: 'fault', id: 'F', bus: 'B1', kind: pick(['lineEarth', 'lineLine', 'doubleLineEarth', 'threePhase']), ohms: between(0.5, 5) });
  return { format: 'wyeward-circuit', version: 1, frequencyHz: pick([50, 60]), sequence: pick(['ABC', 'ACB']), elements: els as CircuitInput['elements'] };
}

