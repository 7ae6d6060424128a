/** solve --case / --all-cases as a real child process: each case prints exactly what solving the edited file prints. */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { applyCase, type CircuitInput } from '../../../shared/engine/index.ts';
import { LOADS, serviceCircuit } from '../../shared/engine/cases/lost-neutral-fixture.ts';

const root = path.resolve(import.meta.dirname, '../../..');
const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-cli-cases-'));

function run(args: string[]) {
  const r = spawnSync(process.execPath, ['--import', 'tsx', 'server/cli/solve.ts', ...args], { cwd: root, encoding: 'utf8' });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}
function file(name: string, content: unknown): string {
  const p = path.join(dir, name);
  writeFileSync(p, JSON.stringify(content));
  return p;
}

const base = serviceCircuit(LOADS, 25, []);
const cases = [
  { id: 'lost-n', name: 'Neutral lost at the drop', changes: [{ element: 'DROP', set: { open: ['n'] } }, { element: 'KITCHEN', set: { each: { kw: 3 } } }] },
  { id: 'no-rod', name: 'Rod removed', changes: [{ remove: 'ROD' }, { add: { type: 'fault', id: 'F1', bus: 'HOUSE', kind: 'lineEarth', ohms: 1 } }] },
];
const withCases = { ...base, cases } as CircuitInput;
const study = file('study.json', withCases);

describe('solve CLI with study cases', () => {
  it('without --case (or with --case base) prints exactly what the file without cases prints', () => {
    const plain = run([file('plain.json', base), '--json']);
    expect(plain.code).toBe(0);
    expect(run([study, '--json']).stdout).toBe(plain.stdout);
    expect(run([study, '--json', '--case', 'base']).stdout).toBe(plain.stdout);
  });

  it('--case <id> prints exactly what solving the edited circuit prints', () => {
    const edited = file('edited.json', applyCase(withCases, 'lost-n'));
    const viaCase = run([study, '--json', '--case', 'lost-n']);
    expect(viaCase.stderr).toBe('');
    expect(viaCase.code).toBe(0);
    expect(viaCase.stdout).toBe(run([edited, '--json']).stdout);
    expect(JSON.parse(viaCase.stdout).nodes['HOUSE.n'].mag).toBeGreaterThan(5); // the neutral really is lost
    // the readable report names the case above the usual report
    const report = run([study, '--case=lost-n']);
    expect(report.stdout.split('\n')[0]).toBe('Study case "Neutral lost at the drop" (lost-n): the base circuit with 2 changes');
    expect(report.stdout).toContain('CAUTION');
  });

  it('--all-cases prints { cases: { base, <id>… } }, each entry what --json prints for it', () => {
    const r = run([study, '--json', '--all-cases']);
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(Object.keys(out)).toEqual(['cases']);
    expect(Object.keys(out.cases)).toEqual(['base', 'lost-n', 'no-rod']);
    expect(out.cases.base).toEqual(JSON.parse(run([study, '--json']).stdout));
    expect(out.cases['no-rod']).toEqual(JSON.parse(run([study, '--json', '--case', 'no-rod']).stdout));
    expect(out.cases['no-rod'].faults).toHaveLength(1);
    const report = run([study, '--all-cases']);
    expect(report.stdout).toContain('Base circuit\n');
    expect(report.stdout).toContain('Study case "Rod removed" (no-rod)');
  });

  it('a failing case is reported in its entry, the others still solve, exit code of the worst failure', () => {
    const bad = file('bad.json', { ...withCases, cases: [...cases, { id: 'typo', name: 'Typo', changes: [{ element: 'DORP', set: { open: ['n'] } }] }, { id: 'short', name: 'Shorted', changes: [{ add: { type: 'switch', id: 'SHORT', from: 'PAD.a', to: 'earth', closed: true } }] }] });
    const r = run([bad, '--json', '--all-cases']);
    expect(r.code).toBe(3); // the shorted source cannot be solved (3) outranks the typo (2)
    const out = JSON.parse(r.stdout);
    expect(out.cases['lost-n'].nodes).toBeDefined();
    expect(out.cases.typo).toEqual({ error: { code: 'invalid-circuit', message: 'case "Typo": element "DORP": no such element in the circuit' } });
    expect(out.cases.short.error.code).toBe('ill-posed-network');
    expect(r.stderr.trim().split('\n')).toEqual(['solve: case "Typo": element "DORP": no such element in the circuit (and 1 more case failed)']);
    // one case alone: exit 2 naming the case and the element
    const one = run([bad, '--json', '--case', 'typo']);
    expect(one.code).toBe(2);
    expect(one.stdout).toBe('');
    expect(one.stderr).toBe('solve: case "Typo": element "DORP": no such element in the circuit\n');
  });

  it('bad options: an unknown case, --case without an id, --case with --all-cases: exit 2', () => {
    const unknown = run([study, '--json', '--case', 'peak']);
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toBe('solve: no case "peak" in this circuit; the cases are: lost-n, no-rod\n');
    expect(run([study, '--json', '--case']).code).toBe(2);
    const both = run([study, '--json', '--case', 'lost-n', '--all-cases']);
    expect(both.code).toBe(2);
    expect(both.stderr).toMatch(/cannot be used together/);
  });
});
