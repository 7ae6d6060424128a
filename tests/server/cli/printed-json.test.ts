/**
 * The CLI's `--json` fast path for primitive-only files (server/cli/printed-json.ts) against the
 * general path (full results → jsonResult → writeJson): the same bytes on generated files of
 * every primitive kind, with flags, floating parts, escaped ids, both sequences; the general path
 * for files it must not take; and, as a real process, the same exit codes and messages on errors.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { EngineError, circuitResults, prepareCircuit, solvePrimitives, type CircuitInput } from '../../../shared/engine/index.ts';
import { writePrintedPrimitiveJson } from '../../../server/cli/printed-json.ts';
import { jsonResult, writeJson } from '../../../server/cli/solve.ts';
import { primitiveFeeder } from '../../bench/primitive-feeder.ts';
import { tinyCircuit } from '../../bench/tiny-circuit.ts';

/** Both paths' text for `file` (the fast path with small chunks, to cross chunk borders often). */
function both(file: unknown): { general: string; fast: string | null; flagCodes: string[] } {
  const prepared = prepareCircuit(file);
  const sol = solvePrimitives(prepared.primitives);
  const result = circuitResults(prepared, sol);
  let general = '';
  writeJson(jsonResult(result), (c) => (general += c));
  const chunks: Uint8Array[] = [];
  const taken = writePrintedPrimitiveJson(prepared, sol, (c) => chunks.push(c), 4096);
  const fast = Buffer.concat(chunks).toString('utf8');
  return { general, fast: taken ? fast : (expect(fast).toBe(''), null), flagCodes: result.flags.map((f) => f.code) };
}

const pol = (mag: number, deg: number) => ({ mag, angleDeg: deg });

/**
 * Every primitive kind on a 480Y/277 V bus "M" (nominal from `buses`): unbalanced wye impedances,
 * a high-impedance neutral (neutral shift, unbalance, low and high voltages), a source with series
 * impedance, a current source, a coupled pair, closed and open switches, an admittance matrix, a
 * ZIP load far below its rating (converted to constant impedance), a floating island, an id that
 * needs escaping.
 */
function everyKind(sequence: 'ABC' | 'ACB', limits?: CircuitInput['limits']): CircuitInput {
  const lag = sequence === 'ABC' ? -120 : 120;
  return {
    format: 'wyeward-circuit',
    version: 1,
    frequencyHz: 50,
    sequence,
    buses: [{ name: 'M', kvLL: 0.48 }],
    ...(limits ? { limits } : {}),
    elements: [
      { type: 'voltageSource', id: 'Va', plus: 'S.a', minus: 'earth', volts: pol(277, 0), seriesOhms: { re: 0.01, im: 0.05 } },
      { type: 'voltageSource', id: 'Vb', plus: 'S.b', minus: 'earth', volts: pol(277, lag) },
      { type: 'voltageSource', id: 'Vc', plus: 'S.c', minus: 'earth', volts: pol(277, 2 * lag), seriesOhms: 0.02 },
      { type: 'coupledBranch', id: 'Lab', from: ['S.a', 'S.b'], to: ['M.a', 'M.b'], ohms: [[{ re: 0.05, im: 0.2 }, { re: 0, im: 0.05 }], [{ re: 0, im: 0.05 }, { re: 0.05, im: 0.2 }]] },
      { type: 'impedance', id: 'Lc', from: 'S.c', to: 'M.c', ohms: { re: 1, im: 4 } },
      { type: 'impedance', id: 'Ln', from: 'M.n', to: 'earth', ohms: 40 },
      { type: 'impedance', id: 'Za', from: 'M.a', to: 'M.n', ohms: { re: 2, im: 0.5 } },
      { type: 'impedance', id: 'Zb', from: 'M.b', to: 'M.n', ohms: { re: 20, im: 1 } },
      { type: 'switch', id: 'Sc', from: 'M.c', to: 'M.c2', closed: true },
      { type: 'impedance', id: 'Zc', from: 'M.c2', to: 'M.n', ohms: pol(8, 30) },
      { type: 'switch', id: 'Sopen', from: 'M.a', to: 'M.c2', closed: false },
      { type: 'admittanceMatrix', id: 'Y', nodes: ['M.a', 'M.b'], siemens: [[{ re: 0, im: 0.001 }, 0], [0, { re: 0, im: 0.001 }]] },
      { type: 'currentSource', id: 'I1', from: 'earth', to: 'M.b', amps: pol(2, -30) },
      { type: 'impedance', id: 'Zfar', from: 'M.a', to: 'F.a', ohms: 500 },
      { type: 'zipLoad', id: 'ZIP', from: 'F.a', to: 'earth', ratedVolts: 277, ratedVA: { re: 20000, im: 5000 }, zip: { z: 0.2, i: 0.3, p: 0.5 } },
      { type: 'zipLoad', id: 'ZIP2', from: 'M.b', to: 'M.n', ratedVolts: 277, ratedVA: { re: 3000, im: 1000 } },
      { type: 'impedance', id: 'island 1', from: 'X1', to: 'X2', ohms: 5 },
      { type: 'impedance', id: 'island "2" ∠ \\ / é', from: 'X2', to: 'X3', ohms: 7 },
    ],
  };
}

describe('primitive-only --json fast path: same bytes as the general path', () => {
  it('on the primitive-only benchmark feeder (300 buses)', () => {
    const r = both(primitiveFeeder(300, 11));
    expect(r.fast).not.toBeNull();
    expect(r.fast).toBe(r.general);
  });
  it('on seeded random primitive-only feeders of several sizes', () => {
    for (const [buses, seed] of [[5, 1], [40, 2], [97, 3], [150, 4], [220, 5], [333, 6]] as const) {
      const r = both(primitiveFeeder(buses, seed));
      expect(r.fast, `${buses} buses, seed ${seed}`).not.toBeNull();
      expect(r.fast, `${buses} buses, seed ${seed}`).toBe(r.general);
    }
  });
  for (const sequence of ['ABC', 'ACB'] as const) {
    it(`on every primitive kind with flags and a floating island (${sequence})`, () => {
      const r = both(everyKind(sequence));
      expect(r.fast).not.toBeNull();
      expect(r.fast).toBe(r.general);
      // the file exercises what it claims: voltage, unbalance, neutral-shift, low-voltage load and floating flags
      for (const code of ['load-low-voltage', 'unbalance', 'neutral-shift', 'floating']) expect(r.flagCodes).toContain(code);
      expect(r.flagCodes.some((c) => c === 'voltage-low' || c === 'voltage-high')).toBe(true);
    });
  }
  it('with limits of the file (IEC set, IEC unbalance metric)', () => {
    const r = both(everyKind('ABC', { set: 'iec-en', unbalanceMetric: 'iec', neutralShiftPercent: 1 }));
    expect(r.fast).toBe(r.general);
  });
  it('on a file of one source and one impedance (no flags)', () => {
    const r = both({ format: 'wyeward-circuit', version: 1, frequencyHz: 60, elements: [{ type: 'voltageSource', id: 'V', plus: 'a', minus: 'earth', volts: 10 }, { type: 'impedance', id: 'R', from: 'a', to: 'earth', ohms: 5 }] });
    expect(r.flagCodes).toEqual([]);
    expect(r.fast).toBe(r.general);
  });
  it('declines (writes nothing) where object key order would differ: index-like ids and node names, "__proto__"', () => {
    const base = { format: 'wyeward-circuit', version: 1, frequencyHz: 60 };
    const src = { type: 'voltageSource', id: 'V', plus: 'a', minus: 'earth', volts: 10 };
    expect(both({ ...base, elements: [src, { type: 'impedance', id: '7', from: 'a', to: 'earth', ohms: 5 }] }).fast).toBeNull();
    expect(both({ ...base, elements: [src, { type: 'impedance', id: 'R', from: 'a', to: '42', ohms: 5 }, { type: 'impedance', id: 'R2', from: '42', to: 'earth', ohms: 5 }] }).fast).toBeNull();
    expect(both({ ...base, elements: [src, { type: 'impedance', id: '__proto__', from: 'a', to: 'earth', ohms: 5 }] }).fast).toBeNull();
  });
  it('declines on a file with building blocks', () => {
    expect(both(tinyCircuit).fast).toBeNull();
  });
  it('the byte writer gives the same bytes at every chunk size, with names to escape and in other scripts', () => {
    // quotes, backslash, a control character, a lone surrogate, DEL, Latin-1, Cyrillic, CJK and an astral character
    const names = ['a"q', 'b\\s', 'c\nl', 'd\ud800x', 'e\u007f', 'Überlandwerk', 'шина', '母線', '𝔸-bus'];
    const file = primitiveFeeder(12, 3);
    file.elements.forEach((e, k) => {
      if (k % 5 === 0) e.id = `${names[k % names.length]}#${k}`;
    });
    const rename = (n: string) => (n.startsWith('b3.') ? `${names[(n.charCodeAt(3) + 1) % names.length]}.${n.slice(3)}` : n);
    for (const e of file.elements) {
      if (e.type === 'impedance' || e.type === 'currentSource') Object.assign(e, { from: rename(e.from), to: rename(e.to) });
      else if (e.type === 'voltageSource') Object.assign(e, { plus: rename(e.plus), minus: rename(e.minus) });
    }
    const prepared = prepareCircuit(file);
    const sol = solvePrimitives(prepared.primitives);
    let general = '';
    writeJson(jsonResult(circuitResults(prepared, sol)), (c) => (general += c));
    for (const n of names) expect(general).toContain(JSON.stringify(n).slice(1, -1));
    for (const size of [1, 2, 3, 5, 64, 4096, undefined]) {
      const chunks: Uint8Array[] = [];
      expect(writePrintedPrimitiveJson(prepared, sol, (c) => chunks.push(c), size)).toBe(true);
      if (size !== undefined && size <= 64) expect(chunks.length).toBeGreaterThan(100); // many chunk borders crossed
      const bytes = Buffer.concat(chunks);
      expect(bytes.equals(Buffer.from(general, 'utf8')), `chunks of ${size}`).toBe(true);
    }
  });
});

describe('solve CLI on primitive-only files, as a process', () => {
  const root = path.resolve(import.meta.dirname, '../../..');
  const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-printed-'));
  const run = (content: unknown, ...flags: string[]) => {
    const f = path.join(dir, `f${Math.random().toString(36).slice(2)}.json`);
    writeFileSync(f, JSON.stringify(content));
    const r = spawnSync(process.execPath, ['--import', 'tsx', 'server/cli/solve.ts', f, '--json', ...flags], { cwd: root, encoding: 'utf8' });
    return { code: r.status, stdout: r.stdout, stderr: r.stderr };
  };
  /** The general path's exit code and stderr line for a file that fails. */
  const expectedFailure = (content: unknown) => {
    try {
      const prepared = prepareCircuit(content);
      solvePrimitives(prepared.primitives);
    } catch (e) {
      expect(e).toBeInstanceOf(EngineError);
      const err = e as EngineError;
      return { code: err.code === 'invalid-circuit' ? 2 : 3, stderr: `solve: ${err.message.split('\n')[0]}\n` };
    }
    throw new Error('expected the file to fail');
  };

  it('--json prints the general path’s bytes, exit 0', () => {
    const file = everyKind('ABC');
    const r = run(file);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toBe(both(file).general);
  });
  it('invalid input: exit 2 with the general path’s message', () => {
    const bad = { format: 'wyeward-circuit', version: 1, frequencyHz: 60, elements: [{ type: 'impedance', id: 'R', from: 'a', to: 'earth', ohms: { re: 1 } }] };
    const r = run(bad);
    expect({ code: r.code, stderr: r.stderr }).toEqual(expectedFailure(bad));
    expect(r.stdout).toBe('');
  });
  it('a network that cannot be solved: exit 3 with the general path’s message', () => {
    // two ideal sources of different voltage in parallel (a zero-impedance loop)
    const loop = { format: 'wyeward-circuit', version: 1, frequencyHz: 60, elements: [{ type: 'voltageSource', id: 'V1', plus: 'a', minus: 'earth', volts: 10 }, { type: 'voltageSource', id: 'V2', plus: 'a', minus: 'earth', volts: 12 }, { type: 'impedance', id: 'R', from: 'a', to: 'earth', ohms: 5 }] };
    const r = run(loop);
    expect({ code: r.code, stderr: r.stderr }).toEqual(expectedFailure(loop));
    expect(r.code).toBe(3);
    expect(r.stdout).toBe('');
  });
});
