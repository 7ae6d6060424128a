/**
 * Who may do what in the review workflow (api-review.md, "Review" and "Comments"). The server
 * enforces the same rules; the UI only offers what would be accepted.
 */
import { roleAtLeast, type Role } from '../../../../shared/api/common.ts';
import type { ReviewState } from '../../../../shared/api/review.ts';

/** Engineers and owners change studies, request review, restore revisions and mark templates. */
export function canWrite(role: Role): boolean {
  return roleAtLeast(role, 'engineer');
}

/** Reviewers and above comment, resolve threads and upload files; viewers read. */
export function canComment(role: Role): boolean {
  return roleAtLeast(role, 'reviewer');
}

/** Review may be requested from a draft or after changes were requested. */
export function canRequestReview(role: Role, status: ReviewState['status']): boolean {
  return canWrite(role) && (status === 'draft' || status === 'changes-requested');
}

/**
 * Approve / request changes: the study is in review, the caller is a chosen reviewer or an owner,
 * and is neither the member who requested the review nor the author of the revision under review.
 */
export function decisionBlocker(state: ReviewState, role: Role, userId: string, revisionAuthorId: string | null): string | null {
  if (state.status !== 'in-review' || !state.review) return 'not-in-review';
  if (!roleAtLeast(role, 'reviewer')) return 'role';
  if (state.review.requestedBy.id === userId || revisionAuthorId === userId) return 'author';
  const chosen = state.review.reviewers.some((r) => r.id === userId);
  if (!chosen && role !== 'owner') return 'not-chosen';
  return null;
}

/** True when the signed-in member may approve or request changes now. */
export function canDecide(state: ReviewState, role: Role, userId: string, revisionAuthorId: string | null): boolean {
  return decisionBlocker(state, role, userId, revisionAuthorId) === null;
}

/** Members who may be asked to review: reviewer, engineer or owner, never the requester. */
export function reviewerCandidates<T extends { userId: string; role: Role }>(members: readonly T[], selfId: string): T[] {
  return members.filter((m) => m.userId !== selfId && roleAtLeast(m.role, 'reviewer'));
}

/**
 * Where a reviewer should start: the diff of the revision under review against the revision the
 * last decision was made on (what they saw before), or against the one before it on a first review.
 */
export function reviewDiffHref(studyId: string, state: ReviewState): string | null {
  if (!state.review) return null;
  const to = state.review.revision;
  const seen = [...state.events].reverse().find((e) => (e.action === 'request-changes' || e.action === 'approve') && e.revision !== null && e.revision < to);
  return seen ? `/studies/${studyId}/diff?from=${seen.revision}&to=${to}` : `/studies/${studyId}/diff?to=${to}`;
}
