/**
 * The report's solve (PDF and print view alike): the base, or a case applied to it, solved exactly
 * as the engine solves the edited circuit; a circuit the engine refuses gives its message in the
 * user's words instead of a result.
 */
import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit } from '../../../shared/engine/index.ts';
import { solveReported } from '../../../shared/report/document.ts';

const demo = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
const withCase = {
  ...demo,
  elements: demo.elements.map((e) => (e.id === 'DROP' ? { ...e, open: [] } : e)),
  cases: [{ id: 'lost-n', name: 'Neutral lost at the drop', changes: [{ element: 'DROP', set: { open: ['n'] } }] }],
};

describe('solveReported', () => {
  it('solves the base as the engine does, with no case name', () => {
    const s = solveReported(withCase);
    expect(s.caseName).toBeNull();
    expect(s.failure).toBeNull();
    expect(s.result).toEqual(solveCircuit(withCase));
  });

  it('solves a case as the circuit edited by hand, and names the case', () => {
    const s = solveReported(withCase, 'lost-n');
    expect(s.caseName).toBe('Neutral lost at the drop');
    const byHand = { ...withCase, cases: undefined, elements: withCase.elements.map((e) => (e.id === 'DROP' ? { ...e, open: ['n'] } : e)) };
    const house = (r: typeof s.result) => r!.buses.find((b) => b.bus === 'HOUSE');
    expect(house(s.result)).toEqual(house(solveCircuit(byHand)));
    // Losing the neutral moves the star point: the case differs from the base.
    expect(house(s.result)).not.toEqual(house(solveReported(withCase).result));
  });

  it('gives the engine’s refusal as words, with no result', () => {
    const broken = { ...demo, elements: demo.elements.filter((e) => e.type !== 'source') };
    const s = solveReported(broken);
    expect(s.result).toBeNull();
    expect(s.failure).toMatch(/\w/);
    expect(s.failure).not.toMatch(/~|\{|\}/);
  });
});

describe('circuit inputs in words', () => {
  it('names every parameter of every demo circuit and example file in words: no file keys such as perLengthUnit', async () => {
    const { readdirSync, readFileSync } = await import('node:fs');
    const path = await import('node:path');
    const { inputGroups } = await import('../../../shared/report/document.ts');
    const dir = path.resolve(import.meta.dirname, '../../../docs/examples');
    const circuits = [...demoCircuits.map((d) => d.circuit), ...readdirSync(dir).filter((f) => f.endsWith('.json')).map((f) => JSON.parse(readFileSync(path.join(dir, f), 'utf8')))];
    expect(circuits.length).toBeGreaterThan(5);
    for (const c of circuits) {
      const text = inputGroups(c).flatMap((g) => g.rows.map((r) => r[1])).join('\n');
      expect(text.length).toBeGreaterThan(0);
      // a camelCase word is a key or a value as written in the file (units such as kW, kV, kVA aside)
      expect(text.match(/\b[a-z]+[A-Z][A-Za-z]*\b/g)?.filter((w) => !/^k(W|V|VA|var)$/.test(w)) ?? [], c.name).toEqual([]);
    }
  });
});
