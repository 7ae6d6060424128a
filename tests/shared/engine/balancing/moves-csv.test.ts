/**
 * The moves CSV for the crew keeps the convention of every results CSV (shared/report/csv.ts): the
 * caution first, as a comment line starting with "# Caution:", before any move is read; then the
 * header and the moves, CRLF line ends, and a cell a spreadsheet would run as a formula made text.
 */
import { describe, expect, it } from 'vitest';
import { movesCsv } from '../../../../shared/engine/index.ts';
import { csvText } from '../../../../shared/report/csv.ts';

const moves = [
  { customer: 'H1', bus: 'P1', from: 'a', to: 'b' },
  { customer: '=cmd()', bus: 'P2, north', from: 'c', to: 'a' },
] as Parameters<typeof movesCsv>[0];

describe('moves CSV', () => {
  it('starts with the caution as a comment line, as the results CSVs do, then the header and the moves', () => {
    const lines = movesCsv(moves).split('\r\n');
    expect(lines[0]).toMatch(/^# Caution: .*Phase moves are work on live equipment.*dangerous voltages/);
    expect(lines[1]).toBe('customer,bus,from,to');
    expect(lines.slice(2)).toEqual(['H1,P1,a,b', `'=cmd(),"P2, north",c,a`, '']);
    expect(lines.filter((l) => l.includes('Caution'))).toHaveLength(1);
    // The same first-line form as a results table's CSV.
    expect(csvText(['x'], []).split('\r\n')[0]).toMatch(/^# Caution: /);
  });

  it('with no moves: the caution and the header', () => {
    expect(movesCsv([]).split('\r\n').slice(1)).toEqual(['customer,bus,from,to', '']);
  });
});
