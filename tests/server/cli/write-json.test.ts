/** The CLI's chunked JSON writer gives exactly JSON.stringify's text (big records entry by entry). */
import { describe, expect, it } from 'vitest';
import { jsonResult, writeJson } from '../../../server/cli/solve.ts';
import { solveCircuit } from '../../../shared/engine/index.ts';
import { radialFeeder } from '../../bench/feeder.ts';

const collect = (value: Record<string, unknown>, chunkChars?: number) => {
  const chunks: string[] = [];
  writeJson(value, (c) => chunks.push(c), chunkChars);
  return { text: chunks.join(''), chunks };
};

describe('writeJson', () => {
  it('writes a large result in chunks, byte for byte what JSON.stringify writes', () => {
    const result = jsonResult(solveCircuit(radialFeeder(300)));
    expect(Object.keys(result.nodes).length).toBeGreaterThan(1000); // the entry-by-entry path
    const { text, chunks } = collect(result, 4096);
    expect(chunks.length).toBeGreaterThan(10);
    expect(text).toBe(JSON.stringify(result) + '\n');
  });

  it('skips undefined values as JSON.stringify does, keeps integer-like key order, and handles small values', () => {
    const big: Record<string, unknown> = {};
    for (let i = 0; i < 1200; i++) big[i % 3 === 0 ? `n${i}` : String(1200 - i)] = i % 7 === 0 ? undefined : { re: i, im: -i, label: i % 5 === 0 ? undefined : 'x' };
    const value = { a: undefined, big, list: [1, undefined, 'two'], nothing: null, small: { k: 1 } };
    expect(collect(value).text).toBe(JSON.stringify(value) + '\n');
    expect(collect(value, 16).text).toBe(JSON.stringify(value) + '\n');
    expect(collect({}).text).toBe('{}\n');
  });
});
