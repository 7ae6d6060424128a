/**
 * Test helper: a SPICE AC netlist under construction, with the element patterns the block writers
 * use (series R + jX, AC sources, coupled conductors by K and H elements, an ideal multi-winding
 * core by E and F controlled sources, earthing) and a 0 V sense source at every block terminal.
 */
import type { Cx } from '../../../../shared/engine/index.ts';

export type CxIn = number | Cx | { mag: number; angleDeg: number };
export type Earthing = 'solid' | 'unearthed' | { ohms: CxIn };

export const num = (x: number) => x.toExponential(15);
const DEG = Math.PI / 180;
export const pol = (m: number, deg: number): Cx => ({ re: m * Math.cos(deg * DEG), im: m * Math.sin(deg * DEG) });
export const cxOf = (v: CxIn): Cx => (typeof v === 'number' ? { re: v, im: 0 } : 're' in v ? v : pol(v.mag, v.angleDeg));

/** Terminal reading: block id, bus (or "node" for an electrode), conductor. */
export const probeKey = (id: string, bus: string, conductor: string) => `${id}|${bus}|${conductor}`;

/** A netlist under construction. */
export class SpiceBuilder {
  lines: string[] = ['* wyeward block differential netlist'];
  /** Our node name → SPICE node ("0" for earth). */
  nodeName = new Map<string, string>([['earth', '0']]);
  /** Probe key → SPICE 0 V source measuring current from the bus into the block. */
  probes = new Map<string, string>();
  private count = 0;
  private solidlyBonded = new Set<string>();
  private terminals = new Map<string, string>();
  constructor(readonly freq: number) {}
  get w() {
    return 2 * Math.PI * this.freq;
  }
  name(prefix: string) {
    return `${prefix}${++this.count}`;
  }
  fresh() {
    return `x${++this.count}`;
  }
  node(n: string) {
    let s = this.nodeName.get(n);
    if (s === undefined) {
      s = `n${this.nodeName.size}`;
      this.nodeName.set(n, s);
    }
    return s;
  }
  /** The block-side node of a terminal, joined to the bus node by a 0 V sense source. */
  terminal(id: string, bus: string, conductor: string, busNodeName = `${bus}.${conductor}`): string {
    const key = probeKey(id, bus, conductor);
    let t = this.terminals.get(key);
    if (t) return t;
    t = this.fresh();
    const v = this.name('V');
    this.lines.push(`${v} ${this.node(busNodeName)} ${t} 0`);
    this.probes.set(key, v);
    this.terminals.set(key, t);
    return t;
  }
  /** Series R + jX from a to b (SPICE nodes). */
  z(a: string, b: string, z: Cx) {
    if (z.re === 0 && z.im === 0) {
      this.lines.push(`${this.name('V')} ${a} ${b} 0`);
      return;
    }
    let from = a;
    if (z.re !== 0) {
      const mid = z.im !== 0 ? this.fresh() : b;
      this.lines.push(`${this.name('R')} ${from} ${mid} ${num(z.re)}`);
      from = mid;
    }
    if (z.im > 0) this.lines.push(`${this.name('L')} ${from} ${b} ${num(z.im / this.w)}`);
    else if (z.im < 0) this.lines.push(`${this.name('C')} ${from} ${b} ${num(-1 / (this.w * z.im))}`);
  }
  /** AC voltage source: V(p) − V(m) = v. */
  emf(p: string, m: string, v: Cx) {
    const mag = Math.hypot(v.re, v.im);
    this.lines.push(`${this.name('V')} ${p} ${m} AC ${num(mag)} ${num(Math.atan2(v.im, v.re) / DEG)}`);
  }
  /** Coupled conductors from[i] → to[i] with the series matrix z (Ω): R, L, K and H elements. */
  coupled(from: string[], to: string[], z: Cx[][]) {
    const m = from.length;
    const sense: string[] = [];
    const inductors: string[] = [];
    const ends: string[] = [];
    for (let i = 0; i < m; i++) {
      let at = from[i];
      if (z[i][i].re !== 0) {
        const nx = this.fresh();
        this.lines.push(`${this.name('R')} ${at} ${nx} ${num(z[i][i].re)}`);
        at = nx;
      }
      if (!(z[i][i].im > 0)) throw new Error('coupled(): self reactances must be inductive');
      const nl = this.fresh();
      const l = this.name('L');
      this.lines.push(`${l} ${at} ${nl} ${num(z[i][i].im / this.w)}`);
      inductors.push(l);
      const ns = this.fresh();
      const sv = this.name('V');
      this.lines.push(`${sv} ${nl} ${ns} 0`);
      sense.push(sv);
      ends.push(ns);
    }
    for (let i = 0; i < m; i++) {
      let at = ends[i];
      for (let j = 0; j < m; j++) {
        if (j === i || z[i][j].re === 0) continue;
        const nx = this.fresh();
        this.lines.push(`${this.name('H')} ${at} ${nx} ${sense[j]} ${num(z[i][j].re)}`);
        at = nx;
      }
      this.lines.push(`${this.name('V')} ${at} ${to[i]} 0`);
    }
    for (let i = 0; i < m; i++)
      for (let j = i + 1; j < m; j++) {
        const x = z[i][j].im;
        if (x === 0) continue;
        const k = x / Math.sqrt(z[i][i].im * z[j][j].im);
        if (!(Math.abs(k) < 1)) throw new Error(`coupled(): coupling ${k} not physical`);
        this.lines.push(`${this.name('K')} ${inductors[i]} ${inductors[j]} ${num(k)}`);
      }
  }
  /**
   * An ideal core with windings (pos, neg SPICE nodes, turns N, series leakage on that winding):
   * V(pos) − V(neg) − z·i = N·e and Σ N·i = 0 (i into pos).
   */
  core(windings: { pos: string; neg: string; turns: number; z: Cx }[]) {
    const e = this.fresh();
    for (const wd of windings) {
      const a = this.fresh();
      const sv = this.name('V');
      this.lines.push(`${sv} ${wd.pos} ${a} 0`);
      const b = wd.z.re === 0 && wd.z.im === 0 ? a : this.fresh();
      if (b !== a) this.z(a, b, wd.z);
      this.lines.push(`${this.name('E')} ${b} ${wd.neg} ${e} 0 ${num(wd.turns)}`);
      this.lines.push(`${this.name('F')} ${e} 0 ${sv} ${num(wd.turns)}`);
    }
  }
  /**
   * Star-point earthing. A second solid bond on a bus node already bonded solidly would close a
   * loop of ideal connections; as documented for the file format, the first bond in file order
   * carries the earth current and later ones are left out.
   */
  earth(node: string, earthing: Earthing | undefined, dflt: 'solid' | 'unearthed', busNodeName?: string) {
    const e = earthing ?? dflt;
    if (e === 'unearthed') return;
    if (e === 'solid') {
      if (busNodeName !== undefined) {
        if (this.solidlyBonded.has(busNodeName)) return;
        this.solidlyBonded.add(busNodeName);
      }
      this.lines.push(`${this.name('V')} ${node} 0 0`);
    }
    else this.z(node, '0', cxOf(e.ohms));
  }
  text(references: string[]): string {
    const out = [...this.lines];
    for (const r of references) out.push(`${this.name('V')} ${this.node(r)} 0 0`);
    out.push('.options noopac', `.ac lin 1 ${num(this.freq)} ${num(this.freq)}`, '.end');
    return out.join('\n') + '\n';
  }
}
