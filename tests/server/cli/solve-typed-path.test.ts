/**
 * The solve CLI's typed path for primitive-only files (`--json` without `--full`: the text
 * scanned into typed arrays, solved and printed from them; shared/engine/typed and
 * server/cli/printed-json.ts) against the general path (JSON.parse → prepareCircuit →
 * solvePrimitives → circuitResults → jsonResult → writeJson): the same bytes on primitive-only
 * feeders of several sizes and seeds and on every docs/examples file it takes; and, as a process,
 * the same stdout, and on bad input the same stderr line and exit code as `--json --full` (which
 * always takes the general path).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { circuitResults, prepareCircuit, printedPrimitiveResultOfText, solvePrimitives } from '../../../shared/engine/index.ts';
import { writePrintedResult } from '../../../server/cli/printed-json.ts';
import { jsonResult, writeJson } from '../../../server/cli/solve.ts';
import { primitiveFeeder } from '../../bench/primitive-feeder.ts';
import { typedFeeder, typedFeederText } from '../../shared/engine/typed/typed-feeder.ts';

const root = path.resolve(import.meta.dirname, '../../..');

/** The general path's --json text of a circuit file's text. */
function generalText(text: string): string {
  const prepared = prepareCircuit(JSON.parse(text));
  let out = '';
  writeJson(jsonResult(circuitResults(prepared, solvePrimitives(prepared.primitives))), (c) => (out += c));
  return out;
}
/** The typed path's --json text (small chunks, to cross chunk borders often), or null when it declines. */
function typedText(text: string): string | null {
  const r = printedPrimitiveResultOfText(text);
  if (!r) return null;
  const chunks: Uint8Array[] = [];
  writePrintedResult(r, (c) => chunks.push(c), 4096);
  return Buffer.concat(chunks).toString('utf8');
}

describe('typed --json path: the general path’s bytes', () => {
  it('on the primitive-only benchmark feeder at several sizes and seeds', () => {
    for (const [buses, seed] of [[2, 5], [50, 1], [400, 7], [1200, 9]] as const) {
      const text = JSON.stringify(primitiveFeeder(buses, seed));
      const typed = typedText(text);
      expect(typed, `${buses} buses, seed ${seed}: declined`).not.toBeNull();
      expect(typed === generalText(text), `${buses} buses, seed ${seed}`).toBe(true);
    }
  });
  it('on 30 seeded files of every accepted shape (pretty-printed or not, keys shuffled, both sequences)', () => {
    for (let seed = 100; seed < 130; seed++) {
      const text = typedFeederText(typedFeeder(seed, { shuffleKeys: seed % 3 === 0 }), seed);
      const typed = typedText(text);
      expect(typed, `seed ${seed}: declined`).not.toBeNull();
      const general = generalText(text);
      if (typed !== general) {
        let i = 0;
        while (typed![i] === general[i]) i++;
        expect(typed!.slice(i - 60, i + 60), `seed ${seed}: first difference at ${i}`).toBe(general.slice(i - 60, i + 60));
      }
    }
  });
  it('on every docs/examples circuit it takes (the examples with building blocks go to the general path)', () => {
    const dir = path.join(root, 'docs/examples');
    const files = readdirSync(dir).filter((f) => f.endsWith('.json'));
    expect(files.length).toBeGreaterThan(0);
    for (const f of files) {
      const text = readFileSync(path.join(dir, f), 'utf8');
      const file = JSON.parse(text) as { elements?: { type: string }[] };
      const primitiveOnly = (file.elements ?? []).every((e) => ['impedance', 'voltageSource', 'currentSource'].includes(e.type));
      const typed = typedText(text);
      if (!primitiveOnly) expect(typed, `${f} has building blocks: the general path`).toBeNull();
      else if (typed !== null) expect(typed === generalText(text), f).toBe(true);
    }
  });
});

describe('solve CLI as a process: typed path and general path alike', () => {
  const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-typed-'));
  const cache = path.join(dir, 'cache');
  let n = 0;
  const write = (text: string) => {
    const f = path.join(dir, `f${n++}.json`);
    writeFileSync(f, text);
    return f;
  };
  const run = (file: string, ...flags: string[]) => {
    const r = spawnSync(process.execPath, ['server/cli/solve-launcher.mjs', file, ...flags], { cwd: root, encoding: 'utf8', env: { ...process.env, WYEWARD_CLI_CACHE: cache } });
    return { code: r.status, stdout: r.stdout, stderr: r.stderr };
  };

  it('--json prints the general path’s bytes through the typed path (its stages in --timings)', () => {
    const text = typedFeederText(typedFeeder(7, { buses: 60, shuffleKeys: true }), 7);
    const r = run(write(text), '--json', '--timings');
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/^solve timings: start-up \+ imports \d+ ms, read \d+ ms, scan \(parse \+ validate\) \d+ ms, solve \d+ ms, results \+ JSON write \d+ ms; total \d+ ms since process start\n$/);
    expect(r.stdout === generalText(text)).toBe(true);
  });

  const src = { type: 'voltageSource', id: 'V', plus: 'a', minus: 'earth', volts: 230 };
  const imp = { type: 'impedance', id: 'R', from: 'a', to: 'b', ohms: { re: 1, im: 2 } };
  const load = { type: 'impedance', id: 'L', from: 'b', to: 'earth', ohms: 10 };
  const file = (elements: unknown[]) => JSON.stringify({ format: 'wyeward-circuit', version: 1, frequencyHz: 60, elements });
  const bad: [string, string, number][] = [
    ['malformed JSON', file([src, imp, load]).slice(0, -2), 2],
    ['an unknown key', file([src, { ...imp, colour: 'red' }, load]), 2],
    ['a zero impedance', file([src, { ...imp, ohms: 0 }, load]), 2],
    ['an impedance too small to invert', file([src, { ...imp, ohms: 1e-200 }, load]), 2],
    ['a node joined to itself', file([src, { ...imp, to: 'a' }, load]), 2],
    ['a repeated id', file([src, imp, { ...load, id: 'R' }]), 2],
    ['an empty node name', file([src, { ...imp, from: '' }, load]), 2],
    ['a number beyond double range', file([src, imp, load]).replace('"ohms":10', '"ohms":1e999'), 2],
    ['a loop of ideal sources', file([src, { ...src, id: 'V2', volts: 231 }, imp, load]), 3],
    ['a current source into a part with no other connection', file([src, imp, load, { type: 'currentSource', id: 'J', from: 'earth', to: 'x', amps: 1 }]), 3],
  ];
  for (const [what, text, code] of bad) {
    it(`${what}: exit ${code}, the same one stderr line as the general path`, () => {
      const f = write(text);
      const typed = run(f, '--json');
      const general = run(f, '--json', '--full');
      expect(typed.code).toBe(code);
      expect(typed.stderr).toMatch(/^solve: .+\n$/);
      expect({ code: typed.code, stderr: typed.stderr, stdout: typed.stdout }).toEqual({ code: general.code, stderr: general.stderr, stdout: '' });
    });
  }
});
