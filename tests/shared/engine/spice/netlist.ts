/**
 * Test helper: write a network of primitives as a SPICE AC netlist, run `ngspice -b`, read the
 * binary raw file back. ngspice is a general-purpose circuit simulator used here as an
 * independent reference for node voltages and source/switch currents.
 *
 * Mapping (one analysis point, `.ac lin 1 f f`, `.options noopac` so no DC operating point is
 * needed — capacitors and floating parts would make the DC matrix singular):
 * - impedance R + jX: a resistor, then an inductor (X > 0, L = X/ω) or a capacitor (X < 0, C = −1/(ωX));
 * - voltage source: `V… plus minus AC |E| ∠E`, behind its series impedance if any;
 * - current source: `I… from to AC |I| ∠I` (SPICE current flows from n+ through the source to n−, our convention too);
 * - closed switch: a 0 V source from → to (its current is the switch current); open switch: omitted;
 * - coupled branch: per conductor R_ii and L_ii; the reactive mutual terms are inductive couplings
 *   K_ij = X_ij/√(X_ii·X_jj); a real mutual term R_ij·I_j is a CCVS (H) in conductor i sensing a
 *   0 V source in conductor j (only where such terms exist: they make ngspice much slower);
 * - admittance stamp: real parts as VCCS (G); imaginary parts through an auxiliary node per
 *   controlling voltage (E copies V_j, a capacitor C = 1/ω draws j·V_j through a 0 V sense source)
 *   mirrored into each row by CCCS (F) with gain B_ij;
 * - floating references: a 0 V source from the reference node to ground (the same reference the
 *   solver reports), so both programs solve the same well-posed problem.
 * zipLoad is not supported (SPICE has no constant-power element).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Cx, Primitive } from '../../../../shared/engine/types.ts';
import { EARTH } from '../../../../shared/engine/types.ts';

/** Path of the ngspice binary (Debian package `ngspice`). */
export const NGSPICE = '/usr/bin/ngspice';

const num = (x: number) => x.toExponential(15);

function polar(c: Cx): string {
  const mag = Math.hypot(c.re, c.im);
  const deg = (Math.atan2(c.im, c.re) * 180) / Math.PI;
  return `AC ${num(mag)} ${num(deg)}`;
}

/** A SPICE netlist and the names to read back. */
export interface Netlist {
  text: string;
  /** Our node name → SPICE node name ("0" for earth). */
  nodeName: Map<string, string>;
  /** Our element id → SPICE source whose current is the element's current, with its sign. */
  currentProbe: Map<string, { source: string; sign: number }>;
}

/** Write primitives as a SPICE AC netlist at `frequencyHz`; `references` are nodes tied to ground by a 0 V source. */
export function toNetlist(prims: readonly Primitive[], frequencyHz: number, references: string[] = []): Netlist {
  const w = 2 * Math.PI * frequencyHz;
  const nodeName = new Map<string, string>([[EARTH, '0']]);
  const node = (n: string) => {
    let s = nodeName.get(n);
    if (s === undefined) {
      s = `n${nodeName.size}`;
      nodeName.set(n, s);
    }
    return s;
  };
  let aux = 0;
  const fresh = () => `x${++aux}`;
  const lines: string[] = ['* wyeward differential test netlist'];
  const currentProbe = new Map<string, { source: string; sign: number }>();
  let el = 0;
  const name = (prefix: string) => `${prefix}${++el}`;

  /** Series R + jX from a to b. */
  const series = (a: string, b: string, z: Cx) => {
    let from = a;
    const hasR = z.re !== 0;
    const hasX = z.im !== 0;
    if (hasR) {
      const mid = hasX ? fresh() : b;
      lines.push(`${name('R')} ${from} ${mid} ${num(z.re)}`);
      from = mid;
    }
    if (hasX) {
      if (z.im > 0) lines.push(`${name('L')} ${from} ${b} ${num(z.im / w)}`);
      else lines.push(`${name('C')} ${from} ${b} ${num(-1 / (w * z.im))}`);
    }
  };

  const capAux = new Map<string, string>(); // controlling node → sense source drawing j·V
  const jSense = (n: string) => {
    let s = capAux.get(n);
    if (s) return s;
    const a = fresh();
    const c = fresh();
    lines.push(`${name('E')} ${a} 0 ${n} 0 1`);
    s = name('V');
    lines.push(`${s} ${a} ${c} 0`);
    lines.push(`${name('C')} ${c} 0 ${num(1 / w)}`);
    capAux.set(n, s);
    return s;
  };

  for (const e of prims) {
    switch (e.type) {
      case 'impedance':
        series(node(e.from), node(e.to), e.ohms);
        break;
      case 'voltageSource': {
        const p = node(e.plus);
        const m = node(e.minus);
        const v = name('V');
        const hasZ = e.seriesOhms && (e.seriesOhms.re !== 0 || e.seriesOhms.im !== 0);
        if (hasZ) {
          const mid = fresh();
          lines.push(`${v} ${mid} ${m} ${polar(e.volts)}`);
          series(mid, p, e.seriesOhms!);
        } else {
          lines.push(`${v} ${p} ${m} ${polar(e.volts)}`);
        }
        // SPICE i(V) flows from + through the source to −; ours leaves plus into the circuit
        currentProbe.set(e.id, { source: v, sign: -1 });
        break;
      }
      case 'currentSource':
        lines.push(`${name('I')} ${node(e.from)} ${node(e.to)} ${polar(e.amps)}`);
        break;
      case 'switch':
        if (e.closed) {
          const v = name('V');
          lines.push(`${v} ${node(e.from)} ${node(e.to)} 0`);
          currentProbe.set(e.id, { source: v, sign: 1 });
        } else {
          node(e.from);
          node(e.to);
        }
        break;
      case 'coupledBranch': {
        const m = e.from.length;
        // a conductor needs a 0 V sense source only if another conductor has a real mutual term on it
        const needSense = Array.from({ length: m }, (_, j) => e.ohms.some((row, i) => i !== j && row[j].re !== 0));
        const hasH = Array.from({ length: m }, (_, i) => e.ohms[i].some((z, j) => i !== j && z.re !== 0));
        const sense: string[] = [];
        const inductor: string[] = [];
        const chains: { at: string; to: string }[] = [];
        for (let i = 0; i < m; i++) {
          let at = node(e.from[i]);
          const to = node(e.to[i]);
          const zii = e.ohms[i][i];
          if (zii.re !== 0) {
            const nx = fresh();
            lines.push(`${name('R')} ${at} ${nx} ${num(zii.re)}`);
            at = nx;
          }
          if (!(zii.im > 0)) throw new Error(`toNetlist: coupled branch ${e.id} needs inductive self terms`);
          const direct = !needSense[i] && !hasH[i];
          const nl = direct ? to : fresh();
          const l = name('L');
          lines.push(`${l} ${at} ${nl} ${num(zii.im / w)}`);
          inductor.push(l);
          if (direct) {
            sense.push('');
            chains.push({ at: '', to });
            continue;
          }
          if (needSense[i]) {
            const ns = fresh();
            const sv = name('V');
            lines.push(`${sv} ${nl} ${ns} 0`);
            sense.push(sv);
            chains.push({ at: ns, to });
          } else {
            sense.push('');
            chains.push({ at: nl, to });
          }
        }
        for (let i = 0; i < m; i++) {
          if (chains[i].at === '') continue;
          let at = chains[i].at;
          for (let j = 0; j < m; j++) {
            if (j === i || e.ohms[i][j].re === 0) continue;
            const nx = fresh();
            lines.push(`${name('H')} ${at} ${nx} ${sense[j]} ${num(e.ohms[i][j].re)}`);
            at = nx;
          }
          lines.push(`${name('V')} ${at} ${chains[i].to} 0`);
        }
        for (let i = 0; i < m; i++)
          for (let j = i + 1; j < m; j++) {
            const x = e.ohms[i][j].im;
            if (x === 0) continue;
            const k = x / Math.sqrt(e.ohms[i][i].im * e.ohms[j][j].im);
            lines.push(`${name('K')} ${inductor[i]} ${inductor[j]} ${num(k)}`);
          }
        break;
      }
      case 'admittanceMatrix': {
        const m = e.nodes.length;
        for (let i = 0; i < m; i++) {
          const ni = node(e.nodes[i]);
          for (let j = 0; j < m; j++) {
            const nj = node(e.nodes[j]);
            const y = e.siemens[i][j];
            if (nj === '0') continue;
            if (y.re !== 0) lines.push(`${name('G')} ${ni} 0 ${nj} 0 ${num(y.re)}`);
            if (y.im !== 0) lines.push(`${name('F')} ${ni} 0 ${jSense(nj)} ${num(y.im)}`);
          }
        }
        break;
      }
      case 'zipLoad':
        throw new Error('toNetlist: zipLoad has no SPICE equivalent');
    }
  }
  for (const r of references) lines.push(`${name('V')} ${node(r)} 0 0`);
  lines.push('.options noopac');
  lines.push(`.ac lin 1 ${num(frequencyHz)} ${num(frequencyHz)}`);
  lines.push('.end');
  return { text: lines.join('\n') + '\n', nodeName, currentProbe };
}

/** A parsed ngspice binary raw file (one AC point): complex value per vector name (lower case). */
export function parseRaw(buf: Buffer): Map<string, Cx> {
  const marker = buf.indexOf('Binary:\n');
  if (marker < 0) throw new Error('ngspice raw file: no "Binary:" section');
  const header = buf.subarray(0, marker).toString('latin1');
  const nvars = Number(/No\. Variables:\s*(\d+)/.exec(header)?.[1]);
  const npoints = Number(/No\. Points:\s*(\d+)/.exec(header)?.[1]);
  if (!/Flags:\s*complex/.test(header)) throw new Error('ngspice raw file: expected complex (AC) data');
  if (!(nvars > 0) || npoints !== 1) throw new Error(`ngspice raw file: expected 1 point, got ${npoints}`);
  const varsAt = header.indexOf('\nVariables:');
  if (varsAt < 0) throw new Error('ngspice raw file: no "Variables:" section');
  const varsText = header.slice(varsAt + '\nVariables:'.length);
  const names = varsText
    .split('\n')
    .map((l) => l.trim())
    .filter((l) => l.length > 0)
    .map((l) => l.split(/\s+/)[1].toLowerCase());
  if (names.length !== nvars) throw new Error(`ngspice raw file: ${names.length} variable names for ${nvars} variables`);
  const data = buf.subarray(marker + 'Binary:\n'.length);
  if (data.length < nvars * 16) throw new Error('ngspice raw file: truncated data');
  const out = new Map<string, Cx>();
  for (let k = 0; k < nvars; k++) out.set(names[k], { re: data.readDoubleLE(16 * k), im: data.readDoubleLE(16 * k + 8) });
  return out;
}

/** ngspice did not finish within the time allowed. */
export class NgspiceTimeout extends Error {}

/** Run ngspice in batch mode on a netlist; returns the raw vectors, the SPICE output text and the wall time (ms). */
export function runNgspice(text: string, timeoutMs?: number): { vectors: Map<string, Cx>; ms: number; log: string } {
  const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-spice-'));
  try {
    const cir = path.join(dir, 'net.cir');
    const raw = path.join(dir, 'net.raw');
    writeFileSync(cir, text);
    const t0 = performance.now();
    const r = spawnSync(NGSPICE, ['-b', '-r', raw, cir], { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024, timeout: timeoutMs, killSignal: 'SIGKILL' });
    const ms = performance.now() - t0;
    const log = `${r.stdout ?? ''}${r.stderr ?? ''}`;
    if (timeoutMs !== undefined && r.signal === 'SIGKILL') throw new NgspiceTimeout(`ngspice stopped after ${Math.round(ms / 1000)} s`);
    if (r.error) throw new Error(`cannot run ${NGSPICE}: ${r.error.message}`);
    if (r.status !== 0) throw new Error(`ngspice exited with ${r.status}:\n${log.slice(-2000)}`);
    // ngspice exits 0 even when the analysis is aborted (e.g. "matrix is singular")
    if (/singular|aborted|error/i.test(r.stderr ?? '')) throw new Error(`ngspice failed:\n${log.slice(-2000)}`);
    let buf: Buffer;
    try {
      buf = readFileSync(raw);
    } catch {
      throw new Error(`ngspice wrote no raw file:\n${log.slice(-2000)}`);
    }
    return { vectors: parseRaw(buf), ms, log };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** Node voltages and probe currents of `prims` computed by ngspice, keyed like the solver's output. */
export function spiceSolve(
  prims: readonly Primitive[],
  frequencyHz: number,
  references: string[] = [],
): { nodeVolts: Map<string, Cx>; currents: Map<string, Cx>; netlist: Netlist } {
  const net = toNetlist(prims, frequencyHz, references);
  const { vectors } = runNgspice(net.text);
  const nodeVolts = new Map<string, Cx>();
  for (const [ours, theirs] of net.nodeName) {
    if (theirs === '0') {
      nodeVolts.set(ours, { re: 0, im: 0 });
      continue;
    }
    const v = vectors.get(`v(${theirs})`);
    if (!v) throw new Error(`ngspice output has no v(${theirs}) for node '${ours}'`);
    nodeVolts.set(ours, v);
  }
  const currents = new Map<string, Cx>();
  for (const [id, { source, sign }] of net.currentProbe) {
    const i = vectors.get(`i(${source.toLowerCase()})`);
    if (!i) throw new Error(`ngspice output has no i(${source}) for element '${id}'`);
    currents.set(id, { re: sign * i.re, im: sign * i.im });
  }
  return { nodeVolts, currents, netlist: net };
}
