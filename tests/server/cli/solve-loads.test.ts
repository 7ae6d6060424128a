/** The CLI's readable report gives each load's own terminal voltage and verdict (engine values, C). */
import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit } from '../../../shared/engine/index.ts';
import { formatReport, jsonResult } from '../../../server/cli/solve.ts';

describe('solve report: loads', () => {
  const r = solveCircuit(demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit);
  it('lists each load with the voltage across its terminals, per unit of its rating and its verdict', () => {
    const text = formatReport(r);
    const e = r.loads.find((l) => l.id === 'ELECTRONICS')!.branches[0];
    expect(text).toMatch(new RegExp(`ELECTRONICS +c-n 167\\.3∠${e.voltage.angleDeg.toFixed(1)}° V = ${e.pu!.toFixed(3)} pu VIOLATION-HIGH`));
    expect(text).toMatch(/HEATER +b-n 68\.78∠-?\d+\.\d° V = 0\.573 pu VIOLATION-LOW/);
    expect(text).toMatch(/HOUSE .*\n.*to n: V0 56\.85∠.*neutral open at DROP/);
  });
  it('--full JSON carries the loads; the lean JSON does not', () => {
    expect(jsonResult(r, true).loads).toBe(r.loads);
    expect('loads' in jsonResult(r)).toBe(false);
  });
});
