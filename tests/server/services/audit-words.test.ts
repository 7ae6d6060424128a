/** Audit details in words: names for ids, no JSON, a readable fallback for details it has no words for. */
import { describe, expect, it } from 'vitest';
import { actionWords, auditText } from '../../../server/services/audit-words.ts';

const U1 = '0b5e1c8a-1111-4a3e-9a43-0b9a1f3f9a10';
const S1 = '7c1e2f4a-2222-4b3e-8a43-1c9a1f3f9a11';
const names = { user: (id: string) => (id === U1 ? 'Dilys Arkwright' : undefined), study: (id: string) => (id === S1 ? 'Tallow Lane drop' : undefined) };

describe('auditText', () => {
  it('says each known action in words with member and study names', () => {
    expect(auditText('review.request', { revision: 2, reviewers: [U1] }, names)).toBe('asked Dilys Arkwright to review revision 2');
    expect(auditText('member.role', { userId: U1, from: 'reviewer', to: 'engineer' }, names)).toBe('Dilys Arkwright: role reviewer → engineer');
    expect(auditText('study.clone', { sourceId: S1, sourceRevision: 3, fromTemplate: true }, names)).toBe('started from the template “Tallow Lane drop”, revision 3');
    expect(auditText('review.reset', { fromStatus: 'approved', approvedRevision: 1, revision: 4 }, names)).toBe(
      'edited in revision 4: back to draft from approved (the approval of revision 1 stays on record)',
    );
    expect(auditText('revision.create', { revision: 1, seeded: true, solved: true }, names)).toBe('saved revision 1 (demo data)');
    expect(auditText('comment.create', { commentId: S1, parentId: null, anchor: { elementId: 'KITCHEN' } }, names)).toBe('commented on element KITCHEN');
    expect(auditText('attachment.upload', { attachmentId: S1, fileName: 'rod.pdf', size: 20480 }, names)).toBe('attached “rod.pdf” (20 kB)');
    expect(auditText('member.remove', { userId: '99999999-9999-4999-8999-999999999999', role: 'viewer' }, names)).toBe('removed a former member (viewer) from the team');
  });

  it('falls back to "key: value" in words for an unknown action, with ids named or left out and never JSON', () => {
    const text = auditText('study.frobnicate', { ownerId: U1, otherId: '99999999-9999-4999-8999-999999999999', extra: { depthM: 2 }, tags: ['a', 'b'] }, names);
    expect(text).toBe('owner: Dilys Arkwright · extra: depth m 2 · tags: a and b');
    expect(text).not.toMatch(/[{}]|[0-9a-f]{8}-/);
  });

  it('names actions in words', () => {
    expect(actionWords('review.request-changes')).toBe('changes requested');
    expect(actionWords('made.up')).toBe('made.up');
  });
});
