/** Page titles: the page's own words first, then the app's name; parts not known yet left out. */
import { describe, expect, it } from 'vitest';
import { documentTitle } from '../../../src/lib/document-title.ts';

describe('documentTitle', () => {
  it('puts the most specific part first and the app last', () => {
    expect(documentTitle('Phase balancing', 'Lane 14')).toBe('Phase balancing — Lane 14 — Wyeward');
    expect(documentTitle('History', undefined)).toBe('History — Wyeward');
    expect(documentTitle(null, '  ')).toBe('Wyeward');
  });
});
