/**
 * docs/circuit-format.schema.json is generated from the zod schemas. This test fails when the
 * committed file is stale; regenerate with `UPDATE_SCHEMA=1 npx vitest run --project shared tests/shared/engine/schema/json-schema.test.ts`.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { circuitJsonSchema, demoCircuits } from '../../../../shared/engine/index.ts';

const file = path.resolve(import.meta.dirname, '../../../../docs/circuit-format.schema.json');
const text = `${JSON.stringify(circuitJsonSchema(), null, 2)}\n`;

describe('published JSON Schema', () => {
  it('docs/circuit-format.schema.json matches the zod schemas', () => {
    if (process.env.UPDATE_SCHEMA === '1') writeFileSync(file, text);
    expect(readFileSync(file, 'utf8')).toBe(text);
  });
  it('names every element type and the fixed top-level fields', () => {
    const s = JSON.parse(text);
    expect(s.properties.format.const).toBe('wyeward-circuit');
    expect(s.properties.version.const).toBe(1);
    const types = s.properties.elements.items.oneOf ?? s.properties.elements.items.anyOf;
    expect(types.length).toBe(17);
  });
  it('the demo circuits are valid JSON with the fixed header', () => {
    for (const d of demoCircuits) {
      const round = JSON.parse(JSON.stringify(d.circuit));
      expect(round.format).toBe('wyeward-circuit');
      expect(round.version).toBe(1);
    }
  });
});
