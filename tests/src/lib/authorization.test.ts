import { describe, expect, it } from 'vitest';
import { ROLE_HINT } from '../../../src/lib/authorization.ts';

describe('role hints (sign-in page demo accounts, invites)', () => {
  it('say what each role may do today, with no promise of features to come', () => {
    expect(ROLE_HINT.reviewer).toBe('reads studies, comments, and approves them or requests changes');
    for (const hint of Object.values(ROLE_HINT)) expect(hint).not.toMatch(/later|soon|coming/i);
  });
});
