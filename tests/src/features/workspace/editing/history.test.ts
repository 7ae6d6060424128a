import { describe, expect, it } from 'vitest';
import { HISTORY_LIMIT, historyReducer, initHistory, type History, type HistoryAction } from '../../../../../src/features/workspace/editing/history.ts';

const run = (h: History<string>, ...actions: HistoryAction<string>[]) => actions.reduce(historyReducer<string>, h);

describe('historyReducer', () => {
  it('undoes and redoes commits in order', () => {
    const h = run(initHistory('a'), { type: 'commit', next: 'b' }, { type: 'commit', next: 'c' });
    expect(h).toEqual({ past: ['a', 'b'], present: 'c', future: [] });
    const u = run(h, { type: 'undo' }, { type: 'undo' });
    expect(u).toEqual({ past: [], present: 'a', future: ['b', 'c'] });
    expect(run(u, { type: 'undo' })).toBe(u); // nothing more to undo
    expect(run(u, { type: 'redo' }).present).toBe('b');
  });

  it('drops the redo stack on a new edit', () => {
    const h = run(initHistory('a'), { type: 'commit', next: 'b' }, { type: 'undo' }, { type: 'commit', next: 'x' });
    expect(h).toEqual({ past: ['a'], present: 'x', future: [] });
  });

  it('replace changes the present without an entry; mark records where a drag began', () => {
    const h = run(initHistory('a'), { type: 'replace', next: 'a1' }, { type: 'replace', next: 'a2' }, { type: 'mark', before: 'a' });
    expect(h).toEqual({ past: ['a'], present: 'a2', future: [] });
    expect(run(h, { type: 'undo' }).present).toBe('a');
  });

  it('update applies each change to the latest present (two changes from one event both land)', () => {
    const h = run(initHistory('a'), { type: 'update', fn: (s) => `${s}+edge` }, { type: 'update', fn: (s) => `${s}+nodes` });
    expect(h).toEqual({ past: [], present: 'a+edge+nodes', future: [] });
  });

  it('keeps at most HISTORY_LIMIT entries and resets to a fresh history', () => {
    let h = initHistory('0');
    for (let i = 1; i <= HISTORY_LIMIT + 5; i++) h = historyReducer(h, { type: 'commit', next: String(i) });
    expect(h.past).toHaveLength(HISTORY_LIMIT);
    expect(h.past[0]).toBe('5');
    expect(run(h, { type: 'reset', next: 'z' })).toEqual({ past: [], present: 'z', future: [] });
  });
});

describe('apply', () => {
  it('runs a command on the present the reducer holds, so two in a row both count', () => {
    let h = initHistory({ n: 0 });
    h = historyReducer(h, { type: 'apply', fn: (d) => ({ n: d.n + 1 }) });
    h = historyReducer(h, { type: 'apply', fn: (d) => ({ n: d.n + 1 }) });
    expect(h.present).toEqual({ n: 2 });
    expect(h.past).toEqual([{ n: 0 }, { n: 1 }]);
    expect(historyReducer(h, { type: 'apply', fn: (d) => d })).toBe(h);
  });
});
