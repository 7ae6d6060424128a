/** JSON Schema (draft 2020-12) of the circuit file format, generated from the zod schemas. */
import { z } from 'zod';
import { circuitSchema } from './circuit.ts';

/** The JSON Schema of a circuit file as written (input side: defaults optional). */
export function circuitJsonSchema(): Record<string, unknown> {
  return {
    ...z.toJSONSchema(circuitSchema, { io: 'input', unrepresentable: 'any' }),
    $id: 'https://wyeward.invalid/schemas/circuit-format-v1.json',
    title: 'Wyeward circuit file, version 1',
    description: 'A multi-conductor three-phase circuit: primitives and building blocks. See docs/circuit-format.md.',
  };
}
