/** The customer list: CSV columns, kvar from pf, and every problem named by row and column in words. */
import { describe, expect, it } from 'vitest';
import { analyseFeeder, checkCustomers, csvDelimiter, CustomerListError, neutralPoint, parseCustomersCsv, rotatingRule, withCustomers, solveCircuit } from '../../../../shared/engine/index.ts';
import { smallCustomers, smallFeeder } from './small-feeder.ts';

function issuesOf(f: () => unknown): string[] {
  try {
    f();
  } catch (e) {
    if (e instanceof CustomerListError) return e.issues.map((i) => `${i.row ?? '-'}|${i.column ?? '-'}|${i.message}`);
    throw e;
  }
  throw new Error('expected a customer list error');
}

describe('parseCustomersCsv', () => {
  it('reads kvar or pf, fixed, model and allowed phases, in any column order and case', () => {
    const list = parseCustomersCsv('Customer,BUS,phase,kw,pf,fixed,model,phases\r\nH1,P1,a,3,0.8,,,\r\n"Shop, corner",P2,B,10,1,yes,i,\r\nH3,P3,C,2,0.95,no,z,bc\r\n');
    expect(list.map((c) => [c.customer, c.bus, c.phase, c.fixed, c.model, c.allowed.join('')])).toEqual([
      ['H1', 'P1', 'A', false, 'p', 'ABC'],
      ['Shop, corner', 'P2', 'B', true, 'i', 'ABC'],
      ['H3', 'P3', 'C', false, 'z', 'BC'],
    ]);
    expect(list[0].kvar).toBeCloseTo(2.25, 12); // 3 kW at pf 0.8: 3·tan(acos 0.8) = 3·0.75 (C)
    expect(list[1].kvar).toBe(0);
  });

  it('names the row and column of each problem', () => {
    const issues = issuesOf(() => parseCustomersCsv('customer,bus,phase,kw,kvar\nH1,P1,D,3,1\nH2,P1,A,three,1\n,P2,B,1,0\nH1,P3,C,1,0\nH5,P3,A,-2,0\n'));
    expect(issues).toEqual([
      '2|phase|the phase must be A, B or C',
      '3|kw|kW must be a number (found "three")',
      '4|customer|the customer name is empty',
      '5|customer|"H1" is already the customer of row 2; each customer appears once',
      '6|kw|kW cannot be negative (generation is not balanced here)',
    ]);
  });

  it('refuses missing columns, kvar with pf, and a short row', () => {
    expect(issuesOf(() => parseCustomersCsv('customer,phase,kw\nH1,A,2\n'))).toEqual(['-|bus|the column "bus" is missing (columns: customer, bus, phase, kw, and kvar or pf)', '-|kvar|give a "kvar" or a "pf" column']);
    expect(issuesOf(() => parseCustomersCsv('customer,bus,phase,kw,kvar,pf\nH1,P1,A,2,1,0.9\n'))).toEqual(['2|pf|give kvar or pf, not both']);
    expect(issuesOf(() => parseCustomersCsv('customer,bus,phase,kw,kvar\nH1,P1,A,2\n'))).toEqual(['2|-|has 4 cells; the header has 5']);
    expect(issuesOf(() => parseCustomersCsv(''))).toEqual(['-|-|the file is empty (expected a header row: customer,bus,phase,kw,kvar)']);
    expect(issuesOf(() => parseCustomersCsv('customer,bus,phase,kw,kvar\n"H1,P1,A,2,1\n'))).toEqual(['-|-|line 2: a quoted field is never closed (a " is missing)']);
  });
});

describe('separators of spreadsheet exports', () => {
  const comma = 'customer,bus,phase,kw,pf,fixed\n"Shop; corner",P2,B,10,1,yes\nH3,P3,C,2,0.95,\n';

  it('reads a semicolon or tab separated list exactly as the comma separated one', () => {
    const expected = parseCustomersCsv(comma);
    expect(expected.map((c) => c.customer)).toEqual(['Shop; corner', 'H3']);
    expect(parseCustomersCsv('customer;bus;phase;kw;pf;fixed\r\n"Shop; corner";P2;B;10;1;yes\r\nH3;P3;C;2;0.95;\r\n')).toEqual(expected);
    expect(parseCustomersCsv('\ufeffcustomer\tbus\tphase\tkw\tpf\tfixed\n"Shop; corner"\tP2\tB\t10\t1\tyes\nH3\tP3\tC\t2\t0.95\t\n')).toEqual(expected);
  });

  it('takes the separator the header line uses most, outside quotes; a comma otherwise', () => {
    expect(csvDelimiter('customer;bus;phase;kw;pf\nH1;P1;A;1,5;0,9\n')).toBe(';');
    expect(csvDelimiter('"a;b;c",bus\n')).toBe(',');
    expect(csvDelimiter('customer\tbus\n')).toBe('\t');
    expect(csvDelimiter('customer\n')).toBe(',');
    expect(csvDelimiter('')).toBe(',');
  });

  it('says how to write a decimal comma', () => {
    expect(issuesOf(() => parseCustomersCsv('customer;bus;phase;kw;pf\nH1;P1;A;1,5;0,9\n'))).toEqual([
      '2|kw|kW must be a number (found "1,5"; write decimals with a point, e.g. 1.5)',
      '2|pf|the power factor must be a number (found "0,9"; write decimals with a point, e.g. 0.9)',
    ]);
  });
});

describe('customers on the feeder', () => {
  const feeder = analyseFeeder(smallFeeder);

  it('checks each customer against the buses and phases of the feeder', () => {
    const list = parseCustomersCsv('customer,bus,phase,kw,kvar\nH1,P9,A,2,0\nS-1,P1,A,1,0\n');
    expect(issuesOf(() => checkCustomers(feeder, list))).toEqual(['2|bus|the feeder has no three-phase bus "P9"', '3|customer|"S-1" is already the name of an element of the feeder; give the customer another name']);
  });

  it('names the buses, or the one meant, when the neutral is to be measured at a bus the feeder lacks', () => {
    const base = solveCircuit(withCustomers(feeder, smallCustomers, {}));
    expect(issuesOf(() => neutralPoint(feeder, base, 'p2'))).toEqual(['-|-|the feeder has no bus "p2" to measure the neutral current at; did you mean "P2"?']);
    expect(issuesOf(() => neutralPoint(feeder, base, 'Q9'))).toEqual([`-|-|the feeder has no bus "Q9" to measure the neutral current at; its buses are ${feeder.order.join(', ')}`]);
  });

  it('adds each customer as a single-phase load between its phase and the bus neutral', () => {
    const circuit = withCustomers(feeder, smallCustomers, { H1: 'C' });
    const r = solveCircuit(circuit);
    const h1 = r.loads.find((l) => l.id === 'H1')!;
    expect(h1.branches[0].fromConductor).toBe('c');
    expect(h1.branches[0].toConductor).toBe('n');
    expect(r.elements.H1.power.re).toBeCloseTo(4200, 6); // constant power by default (P)
  });

  it('rotates A, B, C along the feeder, keeping fixed customers and allowed phases', () => {
    // feeder order P1 (H1, H2), P2 (H3, H4 fixed on B), P3 (H5, H6 limited to A/B, H7)
    expect(rotatingRule(feeder, smallCustomers)).toEqual({ H1: 'A', H2: 'B', H3: 'C', H4: 'B', H5: 'A', H6: 'B', H7: 'C' });
  });
});
