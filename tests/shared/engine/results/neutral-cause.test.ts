/** Why a bus neutral shifts, and the wording of the neutral-shift flag by its cause (P: the usual reading). */
import { describe, expect, it } from 'vitest';
import { demoCircuits, type CircuitInput } from '../../../../shared/engine/index.ts';
import { solveChecked } from '../solve-checked.ts';

type El = CircuitInput['elements'][number];
const wire = { a: 0.01, b: 0.01, c: 0.01, n: 0.01 };
const loads: El[] = [
  { type: 'load', id: 'LA', bus: 'H', connection: 'single', between: ['a', 'n'], each: { ohms: 10 } },
  { type: 'load', id: 'LB', bus: 'H', connection: 'single', between: ['b', 'n'], each: { ohms: 20 } },
  { type: 'load', id: 'LC', bus: 'H', connection: 'single', between: ['c', 'n'], each: { ohms: 30 } },
  { type: 'earthing', id: 'ROD', node: 'H.n', ohms: 25 },
];
const circuit = (elements: El[]): CircuitInput => ({ format: 'wyeward-circuit', version: 1, frequencyHz: 60, elements: [{ type: 'source', id: 'S', bus: 'SVC', kvLL: 0.208 }, ...elements, ...loads] });
const shiftFlag = (r: ReturnType<typeof solveChecked>) => r.flags.find((f) => f.code === 'neutral-shift' && f.bus === 'H');

describe('neutral cause', () => {
  it('a line with its neutral opened: open neutral, naming the line', () => {
    const r = solveChecked(circuit([{ type: 'line', id: 'DROP', from: 'SVC', to: 'H', length: 1, impedance: { kind: 'perConductor', ohmsPerLength: wire }, open: ['n'] }]));
    const h = r.buses.find((b) => b.bus === 'H')!;
    expect(h.neutralCause).toBe('open-neutral');
    expect(h.neutralOpenAt).toEqual(['DROP']);
    expect(shiftFlag(r)!.cause).toBe('open-neutral');
    expect(shiftFlag(r)!.message).toMatch(/the neutral is open upstream \(an opened neutral conductor cuts this bus off from the source neutral\)/);
    // the source bus keeps its own star point
    expect(r.buses.find((b) => b.bus === 'SVC')!.neutralCause).toBe('unbalance');
  });

  it('a switch closed on the phases with the neutral left open: open neutral, naming the switch', () => {
    const r = solveChecked(
      circuit([
        { type: 'line', id: 'DROP', from: 'SVC', to: 'M', length: 1, impedance: { kind: 'perConductor', ohmsPerLength: wire } },
        { type: 'switch3', id: 'TIE', from: 'M', to: 'H', open: ['n'] },
      ]),
    );
    expect(r.buses.find((b) => b.bus === 'H')!.neutralOpenAt).toEqual(['TIE']);
    expect(r.buses.find((b) => b.bus === 'M')!.neutralCause).toBe('unbalance');
  });

  it('a three-wire line to four-wire loads: floating neutral', () => {
    const r = solveChecked(circuit([{ type: 'line', id: 'L3W', from: 'SVC', to: 'H', length: 1, impedance: { kind: 'perConductor', ohmsPerLength: { a: 0.01, b: 0.01, c: 0.01 } } }]));
    expect(r.buses.find((b) => b.bus === 'H')!.neutralCause).toBe('floating-neutral');
    expect(shiftFlag(r)!.message).toMatch(/not joined to any source neutral/);
  });

  it('an intact but long neutral under unbalanced load: unbalance, never "lost neutral"', () => {
    const r = solveChecked(circuit([{ type: 'line', id: 'LONG', from: 'SVC', to: 'H', length: 1, impedance: { kind: 'perConductor', ohmsPerLength: { a: 0.5, b: 0.5, c: 0.5, n: 3 } } }]));
    const f = shiftFlag(r)!;
    expect(f.cause).toBe('unbalance');
    expect(f.message).toMatch(/the neutral is intact/);
    expect(f.message).not.toMatch(/lost/);
  });

  it('the feeder-earth-fault demo: the shift is worded as the fault’s effect, not a lost neutral', () => {
    const r = solveChecked(demoCircuits.find((d) => d.key === 'feeder-earth-fault')!.circuit);
    for (const b of r.buses.filter((x) => x.conductors.includes('n'))) expect(b.neutralCause).toBe('fault');
    const flags = r.flags.filter((f) => f.code === 'neutral-shift');
    expect(flags.length).toBeGreaterThan(0);
    for (const f of flags) expect(f.message).toMatch(/the fault in this study .* not a lost neutral$/);
  });
});
