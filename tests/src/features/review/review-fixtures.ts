/** Contract-shaped review records for component tests (api-review.md; invented people and feeders). */
import type { Comment } from '../../../../shared/api/comments.ts';
import type { ReviewState } from '../../../../shared/api/review.ts';
import type { RevisionSummary } from '../../../../shared/api/revisions.ts';
import type { TeamResponse } from '../../../../shared/api/team.ts';

export const STUDY_ID = '00000000-0000-4000-8000-00000000c0de';

/** The signed-in user of `me()` in helpers/fixtures.ts. */
export const SELF = { id: '00000000-0000-4000-8000-0000000000a1', name: 'Ines Marlowe' };
export const ENGINEER = { id: 'u-eng', name: 'Oskar Penhale' };
export const REVIEWER = { id: 'u-rev', name: 'Dilys Arkwright' };
export const VIEWER = { id: 'u-view', name: 'Cato Wrexley' };

export function team(): TeamResponse {
  return {
    team: { id: 't1', name: 'Harrowgate Works' },
    members: [
      { userId: SELF.id, name: SELF.name, email: 'ines@harrowgate.test', role: 'owner', joinedAt: '2026-10-01T08:00:00.000Z' },
      { userId: ENGINEER.id, name: ENGINEER.name, email: 'oskar@harrowgate.test', role: 'engineer', joinedAt: '2026-10-01T08:00:00.000Z' },
      { userId: REVIEWER.id, name: REVIEWER.name, email: 'dilys@harrowgate.test', role: 'reviewer', joinedAt: '2026-10-01T08:00:00.000Z' },
      { userId: VIEWER.id, name: VIEWER.name, email: 'cato@harrowgate.test', role: 'viewer', joinedAt: '2026-10-01T08:00:00.000Z' },
    ],
    invites: [],
  };
}

export function revision(number: number, author = ENGINEER, overrides: Partial<RevisionSummary> = {}): RevisionSummary {
  return {
    number,
    message: `Revision ${number} of the Tallow Lane drop`,
    author,
    createdAt: `2026-11-0${Math.min(number, 9)}T10:00:00.000Z`,
    engineVersion: '0.1.0',
    restoredFrom: null,
    results: { ok: true, flagCount: number - 1, violationCount: 0 },
    ...overrides,
  };
}

export function reviewState(overrides: Partial<ReviewState> = {}): ReviewState {
  return { status: 'draft', review: null, approvedRevision: null, events: [], risk: null, ...overrides };
}

/** A study in review: `requestedBy` asked `reviewers` to look at revision 2. */
export function inReview(requestedBy = ENGINEER, reviewers = [REVIEWER]): ReviewState {
  return reviewState({
    status: 'in-review',
    review: { requestedBy, reviewers, revision: 2 },
    events: [
      { id: 'e1', at: '2026-11-02T11:00:00.000Z', actor: requestedBy, action: 'request', fromStatus: 'draft', toStatus: 'in-review', revision: 2, reviewers, message: 'Please check the neutral.', acknowledgedViolations: null },
    ],
  });
}

let seq = 0;
export function comment(overrides: Partial<Comment> = {}): Comment {
  seq += 1;
  return {
    id: `c${seq}`,
    parentId: null,
    author: REVIEWER,
    body: 'Looks fine.',
    anchor: null,
    revision: 2,
    mentions: [],
    resolved: false,
    resolvedBy: null,
    resolvedAt: null,
    createdAt: '2026-11-02T12:00:00.000Z',
    editedAt: null,
    deleted: false,
    ...overrides,
  };
}
