/**
 * Test helper: write a circuit of building blocks directly as a SPICE AC netlist from each block's
 * own parameters (never from the engine's expansion into primitives), so that ngspice is an
 * independent reference for the blocks themselves.
 *
 * Models (each from the block's documented meaning, docs/circuit-format.md):
 * - wye source: one AC EMF per phase from the star (`B.n`) behind R + jX per phase, or behind the
 *   3×3 phase matrix of the sequence impedances (Zs = (Z0 + 2Z1)/3, Zm = (Z0 − Z1)/3, (P) symmetrical
 *   components) as coupled inductors; |Z1| = kV²/MVA for a short-circuit level (P);
 * - delta source: three EMFs Vab, Vbc, Vca in a physical delta loop, each behind 3·Z1 (the
 *   equivalent-wye impedance is the one the file gives, (P) Δ–Y transformation); ideal: two EMFs;
 * - line: one R and L per conductor, mutual reactances as inductive couplings K, mutual
 *   resistances as current-controlled voltage sources (H); Carson data from ./carson-reference.ts;
 *   Kron reduction: the neutral conductor kept and earthed at both ends; an open conductor
 *   carries no current and so adds no drop to the others: it is left out; the shunt
 *   capacitance matrix as capacitors between conductors and to earth, half at each end;
 * - transformer unit (and centre-tapped unit): an ideal core by controlled sources — per winding
 *   k an E source V_k = N_k·e (e = volts per turn on a core node) and an F source putting N_k·i_k
 *   into the core node (ampere-turn balance Σ N_k·i_k = 0) — with the leakage resistance on the
 *   HV winding and the leakage reactance on the LV winding (total R + jX referred to LV as rated);
 *   windings wired to the terminals by the vector group as worked out in ./bank-wiring.ts;
 * - loads and capacitor banks: R, L and C elements; kW/kvar (impedance model) as Z = V²/S*;
 * - earthing: solid → 0 V source, {ohms} → R + jX, unearthed → nothing; faults: R + jX or 0 V.
 * Every block terminal gets a 0 V sense source from the bus node, so each block's current per
 * conductor is read from ngspice.
 */
import type { CircuitInput, Cx } from '../../../../shared/engine/index.ts';
import { lvWindingsFor, parseGroup } from './bank-wiring.ts';
import { carsonMatrixOhmsPerMile, MILES, type CarsonWire } from './carson-reference.ts';
import { cxOf, num, pol, SpiceBuilder } from './spice-builder.ts';

type El = CircuitInput['elements'][number];

const cdiv = (a: Cx, b: Cx): Cx => {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
};
const csub = (a: Cx, b: Cx): Cx => ({ re: a.re - b.re, im: a.im - b.im });
const cscale = (a: Cx, k: number): Cx => ({ re: a.re * k, im: a.im * k });

/** Phasor angles of phases a, b, c for a sequence (P): ABC → b lags a by 120°. */
export const seqOffsets = (sequence: 'ABC' | 'ACB') => (sequence === 'ABC' ? [0, -120, 120] : [0, 120, -120]);

/** Leakage R + jX in per unit from the nameplate fields. */
function leakagePu(t: { percentR?: number; percentX?: number; percentZ?: number; xOverR?: number }): Cx {
  if (t.percentZ !== undefined) {
    const r = t.percentZ / 100 / Math.sqrt(1 + t.xOverR! ** 2);
    return { re: r, im: r * t.xOverR! };
  }
  return { re: (t.percentR ?? 0) / 100, im: (t.percentX ?? 0) / 100 };
}

/** Options: bus nominal line-to-line voltages (V) for kW loads and capacitor banks without kvLL. */
export interface BlockNetlistOptions {
  nominalVLL: Map<string, number>;
  splitPhaseBuses: Set<string>;
}

const PH = ['a', 'b', 'c'] as const;

/** Write a whole circuit of blocks into the builder. */
export function writeBlocks(b: SpiceBuilder, circuit: CircuitInput, opts: BlockNetlistOptions): void {
  const seq = circuit.sequence ?? 'ABC';
  const off = seqOffsets(seq);
  for (const el of circuit.elements) writeBlock(b, el, seq, off, opts);
}

function writeBlock(b: SpiceBuilder, el: El, seq: 'ABC' | 'ACB', off: number[], opts: BlockNetlistOptions): void {
  const w = b.w;
  switch (el.type) {
    case 'source': {
      const vln = (el.kvLL * 1000) / Math.sqrt(3);
      const ang = el.angleDeg ?? 0;
      const t = (p: string) => b.terminal(el.id, el.bus, p);
      // impedance in the equivalent-wye sense, as the file states it
      let zMat: Cx[][] | null = null;
      let z1: Cx | null = null;
      const imp = el.impedance;
      if (imp && 'ohms' in imp) z1 = cxOf(imp.ohms);
      else if (imp) {
        let z0: Cx;
        if ('z1' in imp) {
          z1 = cxOf(imp.z1);
          z0 = imp.z0 === undefined ? z1 : cxOf(imp.z0);
        } else {
          const mag = el.kvLL ** 2 / imp.shortCircuitMva;
          z1 = pol(mag, (Math.atan(imp.xOverR) * 180) / Math.PI);
          z0 = cscale(z1, imp.z0OverZ1 ?? 1);
        }
        if ((el.connection ?? 'wye') === 'wye') {
          const zs = cscale({ re: z0.re + 2 * z1.re, im: z0.im + 2 * z1.im }, 1 / 3);
          const zm = cscale(csub(z0, z1), 1 / 3);
          zMat = [0, 1, 2].map((i) => [0, 1, 2].map((j) => (i === j ? zs : zm)));
        }
      }
      if ((el.connection ?? 'wye') === 'wye') {
        const star = t('n');
        const inner = PH.map((p, k) => {
          const o = el.phases?.[p];
          const v = pol(o?.pu !== undefined ? o.pu * vln : vln, o?.angleDeg ?? ang + off[k]);
          const x = b.fresh();
          b.emf(x, star, v);
          return x;
        });
        if (zMat) b.coupled(inner, PH.map(t), zMat);
        else PH.forEach((p, k) => b.z(inner[k], t(p), z1 ?? { re: 0, im: 0 }));
        b.earth(star, el.earthing, 'solid', `${el.bus}.n`);
      } else {
        const va = PH.map((_, k) => pol(vln, ang + off[k]));
        const pairs: [number, number][] = [[0, 1], [1, 2], [2, 0]];
        pairs.forEach(([p, q], k) => {
          if (!z1 && k === 2) return; // an ideal delta: the third EMF is implied by the other two
          const x = z1 ? b.fresh() : t(PH[p]);
          b.emf(x, t(PH[q]), csub(va[p], va[q]));
          if (z1) b.z(x, t(PH[p]), cscale(z1, 3));
        });
      }
      return;
    }
    case 'line': {
      const unit = el.lengthUnit ?? 'km';
      const imp = el.impedance;
      let conductors: string[];
      let zpl: Cx[][];
      let kron = false;
      if (imp.kind === 'carson') {
        conductors = imp.conductors.map((c) => c.conductor);
        zpl = carsonMatrixOhmsPerMile(imp.conductors as CarsonWire[], b.freq, imp.earthResistivityOhmM ?? 100).map((r) => r.map((v) => cscale(v, MILES[unit])));
        kron = imp.kronReduceNeutral ?? false;
      } else if (imp.kind === 'matrix') {
        conductors = [...imp.conductors];
        zpl = imp.ohmsPerLength.map((r) => r.map(cxOf));
      } else if (imp.kind === 'perConductor') {
        conductors = Object.keys(imp.ohmsPerLength);
        zpl = conductors.map((ci) => conductors.map((cj) => (ci === cj ? cxOf((imp.ohmsPerLength as Record<string, number | Cx>)[ci]) : { re: 0, im: 0 })));
      } else {
        const z1 = cxOf(imp.z1PerLength);
        const z0 = cxOf(imp.z0PerLength);
        const zs = cscale({ re: z0.re + 2 * z1.re, im: z0.im + 2 * z1.im }, 1 / 3);
        const zm = cscale(csub(z0, z1), 1 / 3);
        conductors = ['a', 'b', 'c'];
        zpl = [0, 1, 2].map((i) => [0, 1, 2].map((j) => (i === j ? zs : zm)));
        if (imp.neutralOhmsPerLength !== undefined) {
          conductors.push('n');
          zpl = [...zpl.map((r) => [...r, { re: 0, im: 0 }]), [{ re: 0, im: 0 }, { re: 0, im: 0 }, { re: 0, im: 0 }, cxOf(imp.neutralOhmsPerLength)]];
        }
      }
      // an open conductor carries no current, so it adds no drop to the others: it is left out
      // (its terminals get no probe; the engine must report zero current there)
      const open = new Set<string>(el.open ?? []);
      const n = conductors.length;
      const kept = conductors.map((_, i) => i).filter((i) => !open.has(conductors[i]));
      const zk = kept.map((i) => kept.map((j) => cscale(zpl[i][j], el.length)));
      const ends = (bus: string) => conductors.map((c) => (open.has(c) ? '' : kron && c === 'n' ? '0' : b.terminal(el.id, bus, c)));
      const fromT = ends(el.from);
      const toT = ends(el.to);
      if (kept.length > 0) b.coupled(kept.map((i) => fromT[i]), kept.map((i) => toT[i]), zk);
      if (el.shunt) {
        // physical shunt capacitance: B_ij ≤ 0 off the diagonal → capacitor i–j; row sum → to earth
        const y = el.shunt.siemensPerLength.map((r) => r.map(cxOf));
        for (const [ts, k] of [[fromT, el.length / 2], [toT, el.length / 2]] as const) {
          for (let i = 0; i < n; i++) {
            if (open.has(conductors[i]) || ts[i] === '0') continue;
            let rowSum = 0;
            for (let j = 0; j < n; j++) if (!open.has(conductors[j])) rowSum += y[i][j].im;
            if (rowSum !== 0) b.lines.push(`${b.name('C')} ${ts[i]} 0 ${num((rowSum * k) / w)}`);
            for (let j = i + 1; j < n; j++) {
              if (open.has(conductors[j]) || y[i][j].im === 0 || ts[j] === '0') continue;
              b.lines.push(`${b.name('C')} ${ts[i]} ${ts[j]} ${num((-y[i][j].im * k) / w)}`);
            }
          }
        }
      }
      return;
    }
    case 'transformer': {
      const g = parseGroup(el);
      // an HV tap: the HV winding has (1 + steps·stepPercent/100) times its rated turns (P)
      const tap = el.tap ? 1 + ((el.tap.steps ?? 0) * (el.tap.stepPercent ?? 2.5)) / 100 : 1;
      const vH = ((g.hv === 'Y' ? (el.kvHigh * 1000) / Math.sqrt(3) : el.kvHigh * 1000)) * tap;
      const vL = g.lv === 'Y' ? (el.kvLow * 1000) / Math.sqrt(3) : el.kvLow * 1000;
      const sUnit = (el.kva * 1000) / 3;
      const zpu = leakagePu(el);
      // leakage R on the HV winding (referred up by n²), leakage X on the LV winding
      const zBaseL = (vL * vL) / sUnit;
      const n = vH / vL;
      const zHv: Cx = { re: zpu.re * zBaseL * n * n, im: 0 };
      const zLv: Cx = { re: 0, im: zpu.im * zBaseL };
      // internal star points carry the documented names <id>#hvStar / <id>#lvStar (a floating
      // part may be referred to one of them)
      const hvStar = g.hvN ? b.terminal(el.id, el.from, 'n') : b.node(`${el.id}#hvStar`);
      const lvStar = g.lvN ? b.terminal(el.id, el.to, 'n') : b.node(`${el.id}#lvStar`);
      const hvT = (i: number) => (i === 3 ? hvStar : b.terminal(el.id, el.from, PH[i]));
      const lvT = (i: number) => (i === 3 ? lvStar : b.terminal(el.id, el.to, PH[i]));
      for (const u of lvWindingsFor(g)) {
        b.core([
          { pos: hvT(u.hv[0]), neg: hvT(u.hv[1]), turns: vH, z: zHv },
          { pos: lvT(u.lv[0]), neg: lvT(u.lv[1]), turns: vL, z: zLv },
        ]);
      }
      if (g.hv === 'Y') b.earth(hvStar, el.hvEarthing, g.hvN ? 'solid' : 'unearthed', g.hvN ? `${el.from}.n` : undefined);
      if (g.lv === 'Y') b.earth(lvStar, el.lvEarthing, g.lvN ? 'solid' : 'unearthed', g.lvN ? `${el.to}.n` : undefined);
      return;
    }
    case 'splitPhaseTransformer': {
      // (M) Kersting's centre-tapped model: Z_HV = 0.5R + j0.8X on the HV base, Z_X = R + j0.4X on the half-winding base
      const zpu = leakagePu(el);
      const s = el.kva * 1000;
      const vHv = el.kvHigh * 1000;
      const vHalf = (el.lowVolts ?? 240) / 2;
      const [p0, p1] = el.primary;
      b.core([
        { pos: b.terminal(el.id, el.from, p0), neg: b.terminal(el.id, el.from, p1), turns: vHv, z: { re: (0.5 * zpu.re * vHv * vHv) / s, im: (0.8 * zpu.im * vHv * vHv) / s } },
        { pos: b.terminal(el.id, el.to, '1'), neg: b.terminal(el.id, el.to, 'n'), turns: vHalf, z: { re: (zpu.re * vHalf * vHalf) / s, im: (0.4 * zpu.im * vHalf * vHalf) / s } },
        { pos: b.terminal(el.id, el.to, 'n'), neg: b.terminal(el.id, el.to, '2'), turns: vHalf, z: { re: (zpu.re * vHalf * vHalf) / s, im: (0.4 * zpu.im * vHalf * vHalf) / s } },
      ]);
      b.earth(b.terminal(el.id, el.to, 'n'), el.lvEarthing, 'solid', `${el.to}.n`);
      return;
    }
    case 'load': {
      const vll = el.kvLL !== undefined ? el.kvLL * 1000 : opts.nominalVLL.get(el.bus);
      const split = opts.splitPhaseBuses.has(el.bus);
      const vln = vll === undefined ? undefined : split ? vll / 2 : vll / Math.sqrt(3);
      const t = (c: string) => b.terminal(el.id, el.bus, c);
      let branches: { key: string; p: string; q: string; rated?: number }[];
      if (el.connection === 'wye' || el.connection === 'wyeFloating') {
        const star = el.connection === 'wye' ? t('n') : b.node(`${el.id}#star`);
        branches = PH.map((p) => ({ key: p, p: t(p), q: star, rated: vln }));
      } else if (el.connection === 'delta') {
        branches = (['ab', 'bc', 'ca'] as const).map((k) => ({ key: k, p: t(k[0]), q: t(k[1]), rated: vll }));
      } else {
        const [c1, c2] = el.between!;
        const legs = (c: string) => c === '1' || c === '2';
        const rated = el.ratedVolts ?? (c1 === 'n' || c2 === 'n' ? vln : legs(c1) === legs(c2) ? vll : undefined);
        branches = [{ key: c1 + c2, p: t(c1), q: t(c2), rated }];
      }
      if (el.phases) branches = branches.filter((br) => (el.phases as Record<string, unknown>)[br.key] !== undefined);
      for (const br of branches) {
        const spec = (el.each ?? el.total ?? (el.phases as Record<string, unknown>)[br.key]) as Record<string, unknown>;
        writeLoadBranch(b, br.p, br.q, spec, br.rated, el.total ? 1 / branches.length : 1);
      }
      return;
    }
    case 'capacitorBank': {
      const vll = el.kvLL !== undefined ? el.kvLL * 1000 : opts.nominalVLL.get(el.bus)!;
      const conn = el.connection ?? 'wye';
      const v = conn === 'delta' ? vll : vll / Math.sqrt(3);
      // (P) Q = ω·C·V² per branch at rated voltage
      const c = (el.kvar * 1000) / 3 / (w * v * v);
      const t = (x: string) => b.terminal(el.id, el.bus, x);
      if (conn === 'delta') for (const [p, q] of [['a', 'b'], ['b', 'c'], ['c', 'a']]) b.lines.push(`${b.name('C')} ${t(p)} ${t(q)} ${num(c)}`);
      else {
        const star = conn === 'wye' ? t('n') : b.node(`${el.id}#star`);
        for (const p of PH) b.lines.push(`${b.name('C')} ${t(p)} ${star} ${num(c)}`);
      }
      return;
    }
    case 'earthing': {
      const node = b.terminal(el.id, 'node', 'node', el.node);
      b.z(node, '0', cxOf(el.ohms));
      return;
    }
    case 'fault': {
      const phases = el.phases ?? ({ threePhase: ['a', 'b', 'c'], threePhaseEarth: ['a', 'b', 'c'], lineEarth: ['a'], lineLine: ['b', 'c'], doubleLineEarth: ['b', 'c'] } as const)[el.kind];
      const zf = cxOf(el.ohms ?? 0);
      const zg = cxOf(el.earthOhms ?? 0);
      if (el.kind === 'lineEarth') {
        b.z(b.terminal(el.id, el.bus, phases[0]), '0', { re: zf.re + zg.re, im: zf.im + zg.im });
        return;
      }
      const pt = b.fresh();
      for (const p of phases) b.z(b.terminal(el.id, el.bus, p), pt, zf);
      if (el.kind === 'threePhaseEarth' || el.kind === 'doubleLineEarth') b.z(pt, '0', zg);
      return;
    }
    case 'switch3': {
      const conds = el.conductors ?? ['a', 'b', 'c', 'n'];
      const open = new Set<string>(el.open ?? []);
      for (const c of conds) {
        const x = b.terminal(el.id, el.from, c);
        const y = b.terminal(el.id, el.to, c);
        if ((el.closed ?? true) && !open.has(c)) b.lines.push(`${b.name('V')} ${x} ${y} 0`);
      }
      return;
    }
    default:
      throw new Error(`writeBlock: ${el.type} is not written by this helper`);
  }
}

/** One load branch between SPICE nodes p and q from its own spec. */
function writeLoadBranch(b: SpiceBuilder, p: string, q: string, spec: Record<string, unknown>, rated: number | undefined, share: number) {
  const w = b.w;
  if ('ohms' in spec) return b.z(p, q, cxOf(spec.ohms as Cx));
  if ('kw' in spec) {
    if ((spec.model ?? 'impedance') !== 'impedance') throw new Error('writeLoadBranch: only the impedance model has a SPICE element');
    // (P) constant impedance drawing S = P + jQ at rated V: Z = V²/S*
    const s: Cx = { re: (spec.kw as number) * 1000 * share, im: ((spec.kvar as number) ?? 0) * 1000 * share };
    return b.z(p, q, cdiv({ re: rated! * rated!, im: 0 }, { re: s.re, im: -s.im }));
  }
  const r = spec.rOhms as number | undefined;
  const l = spec.lHenry as number | undefined;
  const c = spec.cFarad as number | undefined;
  if ((spec.arrangement ?? 'series') === 'series') {
    let at = p;
    const parts: string[] = [];
    if (r !== undefined && r !== 0) parts.push(`R ${num(r)}`);
    if (l !== undefined && l !== 0) parts.push(`L ${num(l)}`);
    if (c !== undefined) parts.push(`C ${num(c)}`);
    parts.forEach((part, k) => {
      const nx = k === parts.length - 1 ? q : b.fresh();
      const [kind, val] = part.split(' ');
      b.lines.push(`${b.name(kind)} ${at} ${nx} ${val}`);
      at = nx;
    });
    return;
  }
  if (r !== undefined) b.lines.push(`${b.name('R')} ${p} ${q} ${num(r)}`);
  if (l !== undefined) b.lines.push(`${b.name('L')} ${p} ${q} ${num(l)}`);
  if (c !== undefined) b.lines.push(`${b.name('C')} ${p} ${q} ${num(c)}`);
}
