/**
 * docs/examples/wrenfold-close-feeder.json and wrenfold-close-customers.csv are the balancing demo
 * (shared/engine/examples/balancing-feeder.ts) as files for the command line. Regenerate with
 * `UPDATE_EXAMPLES=1 npx vitest run --project shared tests/shared/engine/balancing/demo-files.test.ts`.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyseFeeder, balancingCustomersCsv, balancingFeeder, checkCustomers, parseCustomersCsv } from '../../../../shared/engine/index.ts';

const dir = path.resolve(import.meta.dirname, '../../../../docs/examples');

describe('balancing demo files', () => {
  it('the feeder file is the demo feeder, the CSV the demo customers, and they fit each other', () => {
    const files: [string, string][] = [
      ['wrenfold-close-feeder.json', `${JSON.stringify(balancingFeeder, null, 2)}\n`],
      ['wrenfold-close-customers.csv', balancingCustomersCsv],
    ];
    for (const [name, text] of files) {
      if (process.env.UPDATE_EXAMPLES === '1') writeFileSync(path.join(dir, name), text);
      expect(readFileSync(path.join(dir, name), 'utf8')).toBe(text);
    }
    const customers = parseCustomersCsv(balancingCustomersCsv);
    expect(customers).toHaveLength(36);
    const feeder = analyseFeeder(balancingFeeder);
    expect(() => checkCustomers(feeder, customers)).not.toThrow();
    expect(feeder.busPhases.get('LN1')).toEqual(['A', 'B']); // the two-phase spur
  });
});
