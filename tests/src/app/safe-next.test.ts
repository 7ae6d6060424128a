import { describe, expect, it } from 'vitest';
import { safeNext } from '../../../src/app/safe-next.ts';

describe('safeNext', () => {
  it('keeps a same-site path with its query', () => {
    expect(safeNext('/studies/abc?tab=1')).toBe('/studies/abc?tab=1');
  });
  it.each([null, '', 'https://evil.example/', '//evil.example/x', '/\\evil.example', 'team', '/sign-in?next=/x'])('sends %s to the studies list', (next) => {
    expect(safeNext(next)).toBe('/');
  });
});
