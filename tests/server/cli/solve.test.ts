/** The solve CLI run as a real child process: exit codes, stdout JSON shape, the stderr line. */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { demoCircuits } from '../../../shared/engine/index.ts';

const root = path.resolve(import.meta.dirname, '../../..');
const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-cli-'));

function run(args: string[]) {
  const r = spawnSync(process.execPath, ['--import', 'tsx', 'server/cli/solve.ts', ...args], { cwd: root, encoding: 'utf8' });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}
function file(name: string, content: unknown): string {
  const p = path.join(dir, name);
  writeFileSync(p, typeof content === 'string' ? content : JSON.stringify(content));
  return p;
}

// A divider of primitives only: 100∠0° V behind nothing, 3 Ω then 1 Ω to earth, a closed switch and a coupled pair.
const primitives = {
  format: 'wyeward-circuit',
  version: 1,
  frequencyHz: 60,
  elements: [
    { type: 'voltageSource', id: 'V1', plus: 'n1', minus: 'earth', volts: { mag: 100, angleDeg: 0 } },
    { type: 'impedance', id: 'R1', from: 'n1', to: 'n2', ohms: { re: 3, im: 0 } },
    { type: 'switch', id: 'S1', from: 'n2', to: 'n3', closed: true },
    { type: 'impedance', id: 'R2', from: 'n3', to: 'earth', ohms: 1 },
  ],
};

describe('solve CLI', () => {
  it('--json prints nodes and element currents with the issue conventions, exit 0', () => {
    const r = run([file('divider.json', primitives), '--json']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(Object.keys(out.nodes['n2']).sort()).toEqual(['angleDeg', 'im', 'mag', 're']);
    expect(out.nodes['n2'].re).toBeCloseTo(25, 9); // 100·1/(3+1)
    // impedance and closed switch: from → to; voltage source: leaving plus into the circuit
    expect(out.elements.R1.currents[0].re).toBeCloseTo(25, 9);
    expect(out.elements.S1.currents[0].re).toBeCloseTo(25, 9);
    expect(out.elements.V1.currents[0].re).toBeCloseTo(25, 9);
    expect(out.elements.V1.currents[0].mag).toBeCloseTo(25, 9);
  });
  it('--json for a block lists one current per conductor of its ports', () => {
    const demo = demoCircuits.find((d) => d.key === 'delta-wye-bank')!;
    const r = run([file('bank.json', demo.circuit), '--json']);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.elements['PM-BANK'].currents.length).toBe(3 + 4); // HV a,b,c + LV a,b,c,n
    expect(out.elements['PM-BANK'].ports).toEqual([{ bus: 'PMT', conductors: ['a', 'b', 'c'] }, { bus: 'PM208', conductors: ['a', 'b', 'c', 'n'] }]);
    expect(out.elements['OFFICES'].currentDirection).toBe('into-element');
    expect(out.buses).toBeUndefined();
  });
  it('--json --full adds per-bus results and every element field', () => {
    const demo = demoCircuits.find((d) => d.key === 'delta-wye-bank')!;
    const r = run([file('bank-full.json', demo.circuit), '--json', '--full']);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.buses.find((b: { bus: string }) => b.bus === 'PM208').lineToNeutral.a.angleDeg).toBeLessThan(-25);
    expect(out.elements['PM-BANK'].loadingPercent).toBeGreaterThan(0);
  });
  it('without --json prints the readable report with the safety caution and flags', () => {
    const demo = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!;
    const r = run([file('open-neutral.json', demo.circuit)]);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('CAUTION: Wyeward is an engineering aid.');
    expect(r.stdout).toContain('Lost-neutral conditions put dangerous voltages on equipment.');
    expect(r.stdout).toMatch(/VIOLATION +bus HOUSE c-n: 167\.\d V/);
  });
  it('malformed JSON: exit 2 and one stderr line naming the file, no stack trace', () => {
    const p = file('broken.json', '{ "format": "wyeward-circuit", ');
    const r = run([p]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(new RegExp(`^solve: ${p.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')} is not valid JSON: `));
    expect(r.stderr).not.toMatch(/\bat .*\.ts:\d+/);
  });
  it('unknown element type: exit 2 naming the type and element', () => {
    const r = run([file('unknown.json', { ...primitives, elements: [...primitives.elements, { type: 'teleporter', id: 'T9' }] })]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^solve: invalid circuit: elements\[4\]\.type: unknown element type "teleporter" \(id "T9"\); known types: /);
  });
  it('a missing file: exit 2', () => {
    const r = run([path.join(dir, 'nope.json')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/^solve: cannot read .*nope\.json: ENOENT\n$/);
  });
  it('no file argument: exit 2 with the usage line', () => {
    const r = run([]);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe('solve: usage: solve <file.json> [--json [--full]] [--case <id> | --all-cases]\n');
  });
  it('a network that cannot be solved (source shorted by a switch): exit 3 naming the elements', () => {
    const r = run([file('short.json', { ...primitives, elements: [...primitives.elements, { type: 'switch', id: 'SHORT', from: 'n1', to: 'earth', closed: true }] })]);
    expect(r.code).toBe(3);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/SHORT/);
    expect(r.stderr).toMatch(/V1/);
  });
});

describe('solve CLI and non-physical values', () => {
  it('a negative line resistance: exit 2 naming the element', () => {
    const circuit = {
      format: 'wyeward-circuit',
      version: 1,
      frequencyHz: 60,
      elements: [
        { type: 'source', id: 'SRC1', bus: 'A', kvLL: 0.208 },
        { type: 'line', id: 'FEEDER', from: 'A', to: 'B', length: 100, lengthUnit: 'm', impedance: { kind: 'perConductor', ohmsPerLength: { a: { re: -0.001, im: 0.0003 } } } },
      ],
    };
    const r = run([file('negative-r.json', circuit)]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/negative resistance/);
    expect(r.stderr).toMatch(/FEEDER/);
  });
});
