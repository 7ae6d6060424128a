/** Problems of a circuit file read like form errors: the element by its name, the field in words, what is wrong in words. */
import { describe, expect, it } from 'vitest';
import { InvalidCircuitError, parseCircuit } from '../../../shared/engine/index.ts';
import { circuitIssueFields, circuitIssueWords, issueMessageWords } from '../../../shared/review/circuit-issues.ts';

/** The engine's issues of `circuit`, in words. */
function words(circuit: unknown): string[] {
  try {
    parseCircuit(circuit);
    return [];
  } catch (e) {
    if (!(e instanceof InvalidCircuitError)) throw e;
    return Object.values(circuitIssueFields(circuit, e.issues));
  }
}

const base = { format: 'wyeward-circuit', version: 1, frequencyHz: 60 };
const VALIDATOR = /Invalid input|Too small|Unrecognized|expected number|elements\[|\(id "/;

describe('circuit file problems in words', () => {
  it('"element LOAD3: … P (kW) must be a number" for a kW typed as text', () => {
    expect(words({ ...base, elements: [{ type: 'load', id: 'LOAD3', bus: 'B1', connection: 'single', between: ['a', 'n'], each: { kw: 'three' } }] })).toEqual([
      'element LOAD3: every phase › P (kW) must be a number',
    ]);
  });

  it('names limits, options, unknown fields and unknown types in words', () => {
    const w = words({
      ...base,
      frequencyHz: -5,
      elements: [
        { type: 'line', id: 'L1', from: 'B1', to: 'B2', length: -1, impedance: { kind: 'sequence', z1PerLength: 1, z0PerLength: 1 }, colour: 'red' },
        { type: 'load', id: 'L2', bus: 'B1', connection: 'sideways', each: { kw: 1 } },
        { type: 'warpdrive', id: 'W1' },
        { type: 'source', bus: 'B1', kvLL: 0.2 },
      ],
    });
    expect(w).toEqual(
      expect.arrayContaining([
        'frequency (Hz) must be greater than 0',
        'element L1: length must be greater than 0',
        'element L1: it has a field the format does not know: "colour"',
        'element L2: connection must be one of wye, wyeFloating, delta, single',
        'element W1: “warpdrive” is not a kind of element Wyeward knows (the circuit file format lists them)',
        'element 4 (it has no name): its name (id) is missing',
      ]),
    );
    for (const x of w) expect(x).not.toMatch(VALIDATOR);
  });

  it('names the element from the engine’s label when the file is not at hand', () => {
    expect(circuitIssueWords(null, { path: 'elements[2].kva', message: 'Too small: expected number to be >0 (id "TX1")' })).toBe('element TX1: rating (kVA) must be greater than 0');
  });

  it('says two elements share a name', () => {
    const load = { type: 'load', id: 'L', bus: 'B1', connection: 'wye', each: { kw: 1 } };
    expect(words({ ...base, elements: [load, load] })).toEqual(['two elements are named L; rename one of them']);
  });

  it('turns validator phrasing into words and leaves sentences as they are', () => {
    expect(issueMessageWords('Invalid input: expected string, received undefined')).toBe('is missing');
    expect(issueMessageWords('Invalid input: expected boolean, received string (id "X")')).toBe('must be true or false');
    expect(issueMessageWords('Too small: expected number to be >=0')).toBe('must be at least 0');
    expect(issueMessageWords('Name is required')).toBe('Name is required');
  });
});
