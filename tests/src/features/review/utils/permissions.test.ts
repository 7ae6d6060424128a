import { describe, expect, it } from 'vitest';
import type { ReviewState } from '../../../../../shared/api/review.ts';
import { canRequestReview, decisionBlocker, reviewDiffHref, reviewerCandidates } from '../../../../../src/features/review/utils/permissions.ts';
import { ENGINEER, inReview, REVIEWER, SELF, team } from '../review-fixtures.ts';

describe('review permissions', () => {
  it('request review: write roles, from draft or changes requested only', () => {
    expect(canRequestReview('engineer', 'draft')).toBe(true);
    expect(canRequestReview('owner', 'changes-requested')).toBe(true);
    expect(canRequestReview('engineer', 'in-review')).toBe(false);
    expect(canRequestReview('engineer', 'approved')).toBe(false);
    expect(canRequestReview('reviewer', 'draft')).toBe(false);
  });

  it('decisions: chosen reviewer or owner, never the requester or the revision author, only in review', () => {
    const state = inReview(ENGINEER, [REVIEWER]);
    expect(decisionBlocker(state, 'reviewer', REVIEWER.id, ENGINEER.id)).toBeNull();
    expect(decisionBlocker(state, 'owner', SELF.id, ENGINEER.id)).toBeNull();
    expect(decisionBlocker(state, 'engineer', SELF.id, ENGINEER.id)).toBe('not-chosen');
    expect(decisionBlocker(state, 'owner', ENGINEER.id, ENGINEER.id)).toBe('author');
    expect(decisionBlocker(state, 'reviewer', REVIEWER.id, REVIEWER.id)).toBe('author');
    expect(decisionBlocker(state, 'viewer', REVIEWER.id, ENGINEER.id)).toBe('role');
    expect(decisionBlocker({ ...state, status: 'approved' }, 'reviewer', REVIEWER.id, ENGINEER.id)).toBe('not-in-review');
  });

  it('reviewer candidates leave out yourself and viewers', () => {
    expect(reviewerCandidates(team().members, ENGINEER.id).map((m) => m.name)).toEqual(['Ines Marlowe', 'Dilys Arkwright']);
  });

  it('the diff link starts from the revision of the last decision, else from the one before', () => {
    const first = inReview(ENGINEER, [REVIEWER]);
    expect(reviewDiffHref('s1', first)).toBe('/studies/s1/diff?to=2');
    const again: ReviewState = {
      ...first,
      review: { requestedBy: ENGINEER, reviewers: [REVIEWER], revision: 5 },
      events: [
        ...first.events,
        { id: 'e2', at: '2026-11-02T12:00:00.000Z', actor: REVIEWER, action: 'request-changes', fromStatus: 'in-review', toStatus: 'changes-requested', revision: 2, reviewers: [], message: 'Fix the neutral.', acknowledgedViolations: null },
      ],
    };
    expect(reviewDiffHref('s1', again)).toBe('/studies/s1/diff?from=2&to=5');
    expect(reviewDiffHref('s1', { ...first, review: null })).toBeNull();
  });
});
