/** The customer CSV read in the browser (papaparse, then the engine's schema): customers, or problems by row and column. */
import { describe, expect, it } from 'vitest';
import { readCustomersCsv } from '../../../../../src/features/balancing/utils/read-customers.ts';
import { MAX_CUSTOMERS_CSV_CHARS } from '../../../../../shared/api/balancing.ts';
import { balancingCustomersCsv, CustomerListError, parseCustomersCsv } from '../../../../../shared/engine/index.ts';

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

  it('reads what the server reads: a semicolon or tab separated export gives the same customers on both sides', () => {
    for (const sep of [';', '\t']) {
      const text = balancingCustomersCsv.replace(/,/g, sep);
      const r = readCustomersCsv(text);
      if (!r.ok) throw new Error(r.problems.join('; '));
      expect(r.customers).toEqual(parseCustomersCsv(balancingCustomersCsv));
      expect(parseCustomersCsv(r.text)).toEqual(r.customers); // the text sent is read the same by the server
    }
  });

  it('gives an empty file the engine\'s words, not the CSV library\'s', () => {
    let words = '';
    try {
      parseCustomersCsv('');
    } catch (e) {
      words = (e as CustomerListError).issues[0].message;
    }
    expect(words).toMatch(/empty/);
    expect(readCustomersCsv('')).toEqual({ ok: false, problems: [words] });
    expect(readCustomersCsv('\ufeff\n\n')).toEqual({ ok: false, problems: [words] });
  });

  it('refuses a file over the size the server takes, saying so, before anything is sent', () => {
    const row = `H1,P1,A,1,0.95,${'x'.repeat(200)}\n`;
    const text = 'customer,bus,phase,kw,pf,notes\n' + row.repeat(Math.ceil(MAX_CUSTOMERS_CSV_CHARS / row.length) + 1);
    const r = readCustomersCsv(text);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.problems).toEqual([expect.stringMatching(/^the file is too large \(\d[\d ]* characters; at most 500 000, about 5 000 customers\)$/)]);
  });
});
