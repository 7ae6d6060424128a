import { describe, expect, it } from 'vitest';
import { toTsv } from '../../../../../src/features/workspace/results/tsv.ts';

describe('toTsv', () => {
  it('writes a header line and one tab-separated line per row, ending with a newline', () => {
    expect(toTsv(['Bus', '|V| (V)'], [['PAD', '120.1'], ['HOUSE', '141.6']])).toBe('Bus\t|V| (V)\nPAD\t120.1\nHOUSE\t141.6\n');
  });
  it('turns tabs and line breaks inside a cell into spaces so the columns stay aligned', () => {
    expect(toTsv(['a'], [['x\ty\r\nz']])).toBe('a\nx y z\n');
  });
});
