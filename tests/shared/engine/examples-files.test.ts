/**
 * docs/examples/<key>.json are the demo circuits as files, for the command line (README). This test
 * fails when a file is stale; regenerate with
 * `UPDATE_EXAMPLES=1 npx vitest run --project shared tests/shared/engine/examples-files.test.ts`.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit } from '../../../shared/engine/index.ts';

const dir = path.resolve(import.meta.dirname, '../../../docs/examples');

describe('docs/examples', () => {
  for (const demo of demoCircuits) {
    it(`${demo.key}.json is the demo circuit "${demo.name}" and solves`, () => {
      const file = path.join(dir, `${demo.key}.json`);
      const text = `${JSON.stringify(demo.circuit, null, 2)}\n`;
      if (process.env.UPDATE_EXAMPLES === '1') writeFileSync(file, text);
      const stored = readFileSync(file, 'utf8');
      expect(stored).toBe(text);
      const result = solveCircuit(JSON.parse(stored));
      expect(result.buses.length).toBeGreaterThan(0);
    });
  }
});
