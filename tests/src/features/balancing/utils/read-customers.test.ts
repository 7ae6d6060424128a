/** The customer CSV read in the browser (papaparse, then the engine's schema): customers, or problems by row and column. */
import { describe, expect, it } from 'vitest';
import { readCustomersCsv } from '../../../../../src/features/balancing/utils/read-customers.ts';
import { balancingCustomersCsv } from '../../../../../shared/engine/index.ts';

describe('readCustomersCsv', () => {
  it('reads the demo list: 36 customers, kvar from pf, two fixed', () => {
    const r = readCustomersCsv(balancingCustomersCsv);
    if (!r.ok) throw new Error(r.problems.join('; '));
    expect(r.customers).toHaveLength(36);
    expect(r.customers.filter((c) => c.fixed).map((c) => c.customer)).toEqual(['No 11', 'No 29']);
    const first = r.customers[0];
    expect(first.kvar).toBeCloseTo(first.kw * Math.tan(Math.acos(0.97)), 12);
  });

  it('names the row and column of each problem', () => {
    const r = readCustomersCsv('customer,bus,phase,kw,kvar\nH1,P1,A,2,0\nH2,P1,Q,2,0\n"H3, end",P2,B,x,0\n');
    expect(r).toEqual({ ok: false, problems: ['row 3, column phase: the phase must be A, B or C', 'row 4, column kw: kW must be a number (found "x")'] });
  });
});
