/** A revision's danger: how many violations, which is worst (an over-voltage first), in the words of the diagram. */
import { describe, expect, it } from 'vitest';
import { demoCircuits } from '../../../shared/engine/index.ts';
import { revisionRisk, riskSentence, summarizeCircuit, worstFlag, type FlagSummary } from '../../../shared/review/index.ts';

const flag = (code: FlagSummary['code'], value: number, limit: number): FlagSummary => ({ key: `${code}|${value}`, severity: 'violation', code, value, limit, unit: 'V', message: `${code} ${value}` });

describe('revision risk', () => {
  it('ranks an over-voltage above an under-voltage even when the dip is deeper (P: over-voltage destroys equipment)', () => {
    expect(worstFlag([flag('voltage-low', 0, 110), flag('voltage-high', 130, 127), flag('voltage-high', 180, 127)])?.value).toBe(180);
    expect(worstFlag([])).toBeUndefined();
  });

  it('counts the open-neutral demo’s violations and names the worst in words', () => {
    const demo = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
    const s = summarizeCircuit(demo);
    if (!s.ok) throw new Error(s.error.message);
    const r = revisionRisk(4, s, demo);
    expect(r.violationCount).toBe(s.flags.filter((f) => f.severity === 'violation').length);
    expect(r.violationCount).toBeGreaterThan(0);
    expect(r.worst).toMatch(/^bus HOUSE [abc]-n: .* is above the violation limit/);
    expect(riskSentence(r)).toMatch(new RegExp(`^Revision 4 has ${r.violationCount} violations; the worst: bus HOUSE`));
  });

  it('says when a revision does not solve, and when it has no violations', () => {
    const r = revisionRisk(2, { ok: false, error: { code: 'singular', message: 'switch3 K~bus~sw: no path', elementIds: [] } }, { elements: [] });
    expect(riskSentence(r)).toBe('Revision 2 does not solve: connection K–its bus: no path.');
    expect(riskSentence(revisionRisk(1, { ok: true, buses: [], neutralCurrents: [], flags: [] }, null))).toBe('Revision 1 has no violations.');
  });
});
