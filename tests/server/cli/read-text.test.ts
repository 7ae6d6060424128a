/** readText (server/cli/read-text.ts): the same string as readFileSync(file, 'utf8') for any bytes. */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { readText } from '../../../server/cli/read-text.ts';

const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-read-text-'));

describe('readText', () => {
  const cases: [string, Buffer][] = [
    ['plain ASCII JSON', Buffer.from('{"elements":[{"id":"Z1","ohms":1.5}]}\n')],
    ['UTF-8 names (Ω, ∠, é)', Buffer.from('{"id":"Zé Ω∠30°"}')],
    ['a byte-order mark', Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from('{"a":1}')])],
    ['invalid UTF-8 and Latin-1 bytes', Buffer.from([0x7b, 0x22, 0xe9, 0x22, 0xff, 0x80, 0x7d])],
    ['an empty file', Buffer.alloc(0)],
  ];
  for (const [what, bytes] of cases) {
    it(what, () => {
      const file = path.join(dir, `${what.replace(/\W+/g, '-')}.json`);
      writeFileSync(file, bytes);
      expect(readText(file)).toBe(readFileSync(file, 'utf8'));
    });
  }
  it('throws like readFileSync for a missing file', () => {
    expect(() => readText(path.join(dir, 'nope.json'))).toThrow(expect.objectContaining({ code: 'ENOENT' }));
  });
});
