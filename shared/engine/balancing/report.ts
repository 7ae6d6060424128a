/**
 * What a balancing result says to people: the move list as CSV for the crew (with the caution in
 * it, since phase moves are work on live equipment) and the figures' labels.
 */
import type { BalanceMove, BalanceResult } from './balance.ts';
import type { BalanceFigures } from './figures.ts';

/** The caution printed with every move list (and in its CSV). */
export const MOVES_CAUTION =
  'CAUTION: Wyeward is an engineering aid; results are only as good as the model. Phase moves are work on live equipment: follow local codes and licensed practice. A lost or open neutral puts dangerous voltages on equipment and people.';

/** A CSV field: quoted when it holds a comma, quote or line break; a leading = + @ (or a non-numeric -) made text so spreadsheets do not run it (P). */
const cell = (s: string) => {
  const guarded = /^[=+@]/.test(s) || (/^-/.test(s) && !/^-?\d/.test(s)) ? `'${s}` : s;
  return /[",\n\r]/.test(guarded) ? `"${guarded.replace(/"/g, '""')}"` : guarded;
};

/**
 * CSV of the moves, as every results CSV is written (shared/report/csv.ts): the caution first, as a
 * comment line "# Caution: …" read before any move, then customer,bus,from,to; CRLF line ends.
 */
export function movesCsv(moves: BalanceMove[]): string {
  const rows = [`# Caution: ${MOVES_CAUTION.replace(/^CAUTION:\s*/, '')}`, 'customer,bus,from,to', ...moves.map((m) => [m.customer, m.bus, m.from, m.to].map(cell).join(','))];
  return `${rows.join('\r\n')}\r\n`;
}

/** The rows of a before/after table: label, unit and how to read each figure. */
export const FIGURE_ROWS: { label: string; unit: string; get: (f: BalanceFigures) => number; digits: number }[] = [
  { label: 'Neutral current', unit: 'A', get: (f) => f.neutralCurrentA, digits: 1 },
  { label: 'Worst unbalance, IEC |V2|/|V1|', unit: '%', get: (f) => f.maxUnbalancePercent.iec, digits: 3 },
  { label: 'Worst unbalance, line voltages (NEMA)', unit: '%', get: (f) => f.maxUnbalancePercent.nema, digits: 3 },
  { label: 'Worst unbalance, phase voltages (IEEE)', unit: '%', get: (f) => f.maxUnbalancePercent.ieee, digits: 3 },
  { label: 'Losses', unit: 'kW', get: (f) => f.lossesKw, digits: 3 },
  { label: 'Lowest customer voltage', unit: 'pu', get: (f) => f.minCustomerVoltagePu, digits: 4 },
  { label: 'Highest customer voltage', unit: 'pu', get: (f) => f.maxCustomerVoltagePu, digits: 4 },
];

const DEFINITION_WORDS = { iec: 'IEC |V2|/|V1|', nema: 'line voltages, NEMA', ieee: 'phase voltages, IEEE' } as const;

/** A list in words: "a", "a and b", "a, b and c". */
const listWords = (items: string[]) => (items.length <= 1 ? items.join('') : `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`);

/**
 * The objective in words ("neutral current leaving bus S"; a mix: "weighted mix of the neutral
 * current leaving bus S (weight 1) and the losses (weight 2), each relative to its value before
 * balancing").
 */
export function objectiveWords(r: Pick<BalanceResult, 'objective' | 'neutralMeasuredAt'>): string {
  const o = r.objective;
  const neutral = `neutral current ${r.neutralMeasuredAt.direction === 'out' ? 'leaving' : 'arriving at'} bus ${r.neutralMeasuredAt.bus}`;
  const unbalance = `worst voltage unbalance along the feeder (${DEFINITION_WORDS[o.definition ?? 'iec']})`;
  switch (o.objective) {
    case 'neutral':
      return neutral;
    case 'unbalance':
      return unbalance;
    case 'losses':
      return 'losses';
    case 'voltage':
      return 'drop of the lowest customer voltage below 1 pu';
    case 'mix': {
      const terms = { neutral: `the ${neutral}`, unbalance: `the ${unbalance}`, losses: 'the losses', voltage: 'the drop of the lowest customer voltage below 1 pu' } as const;
      const parts = (['neutral', 'unbalance', 'losses', 'voltage'] as const).filter((k) => (o.weights?.[k] ?? 0) > 0).map((k) => `${terms[k]} (weight ${o.weights![k]})`);
      return `weighted mix of ${listWords(parts)}, each relative to its value before balancing`;
    }
  }
}
