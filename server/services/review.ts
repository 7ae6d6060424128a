/**
 * The review state machine: draft → (request) → in-review → (approve) → approved, or
 * (request-changes) → changes-requested → (request) → in-review … An edit of the content returns
 * any reviewed study to draft (studies.ts, applyEdit). Every transition is a review event.
 *
 * The **author** of a review is the member who requested it and also the author of the revision
 * under review; neither may approve it or request changes. Approvers are the chosen reviewers and
 * the team's owners.
 */
import { and, asc, eq, inArray } from 'drizzle-orm';
import { roleAtLeast } from '../../shared/api/common.ts';
import type { ReviewActionRequest, ReviewEvent, ReviewState } from '../../shared/api/review.ts';
import type { StudyStatus } from '../../shared/api/studies.ts';
import type { Actor } from '../auth/index.ts';
import type { Db } from '../db/index.ts';
import { memberships, reviewEvents, studies, users } from '../db/schema.ts';
import { AppError, fieldError, isUuid, notFound } from '../errors.ts';
import type { Mailer } from '../mail/index.ts';
import { recordAudit } from './audit.ts';
import { notify, recipients, studyLink } from './notifications.ts';
import { revisionRisk, riskSentence, type RevisionRisk } from '../../shared/review/risk.ts';
import { ensureRevision, getRevision, type Conn } from './revisions.ts';
import { getStudy, visible } from './studies.ts';

const STATUS_WORDS: Record<StudyStatus, string> = {
  draft: 'a draft',
  'in-review': 'in review',
  'changes-requested': 'waiting for changes',
  approved: 'approved',
};

/** Why an action is not allowed from a status (409), or null when it is. */
function illegal(action: ReviewActionRequest['action'], status: StudyStatus): string | null {
  if (action === 'request') {
    if (status === 'draft' || status === 'changes-requested') return null;
    return status === 'in-review'
      ? 'This study is already in review; wait for the reviewers, or edit it to withdraw the request.'
      : 'This study is approved; edit it to start a new review.';
  }
  if (status === 'in-review') return null;
  return `This study is ${STATUS_WORDS[status]}, not in review; its author must request a review first.`;
}

/** The danger of revision `n` of a study (violations, the worst one in the words of the diagram), or null when there is no such revision. */
export async function riskOf(db: Conn, studyId: string, n: number | null | undefined): Promise<RevisionRisk | null> {
  if (n === null || n === undefined) return null;
  const rev = await getRevision(db, studyId, n).catch(() => null);
  return rev ? revisionRisk(rev.number, rev.summary, rev.content.circuit) : null;
}

/** The review record of a study: status, the open (or last) request, the approved revision, every event, and the danger of the revision concerned. */
export async function getReviewState(db: Db, actor: Actor, id: string): Promise<ReviewState> {
  const study = await getStudy(db, actor, id);
  const rows = await db
    .select({ e: reviewEvents, actorName: users.name })
    .from(reviewEvents)
    .innerJoin(users, eq(users.id, reviewEvents.actorId))
    .where(eq(reviewEvents.studyId, id))
    .orderBy(asc(reviewEvents.at), asc(reviewEvents.id));
  const ids = [...new Set(rows.flatMap((r) => r.e.reviewers))];
  const names = new Map((ids.length ? await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids)) : []).map((u) => [u.id, u.name]));
  const events: ReviewEvent[] = rows.map(({ e, actorName }) => ({
    id: e.id,
    at: e.at.toISOString(),
    actor: { id: e.actorId, name: actorName },
    action: e.action,
    fromStatus: e.fromStatus as StudyStatus,
    toStatus: e.toStatus as StudyStatus,
    revision: e.revision,
    reviewers: e.reviewers.map((r) => ({ id: r, name: names.get(r) ?? '(removed)' })),
    message: e.message,
    acknowledgedViolations: e.acknowledgedViolations ?? null,
  }));
  const concerned = study.status === 'in-review' ? study.review?.revision : (study.approvedRevision ?? study.revision ?? study.review?.revision);
  return {
    status: study.status,
    review: study.review ?? null,
    approvedRevision: study.approvedRevision ?? null,
    events,
    risk: await riskOf(db, id, concerned),
  };
}

/** Applies one review action; answers the new review state. */
export async function reviewAction(db: Db, mailer: Mailer, appUrl: string, actor: Actor, id: string, input: ReviewActionRequest): Promise<ReviewState> {
  if (!isUuid(id)) throw notFound();
  const outcome = await db.transaction(async (tx) => {
    const [s] = await tx.select().from(studies).where(visible(actor, id)).limit(1);
    if (!s) throw notFound();
    if (input.action === 'request' && !roleAtLeast(actor.role, 'engineer')) {
      throw new AppError(403, 'forbidden', `Your role (${actor.role}) does not allow requesting a review; it needs engineer or above.`);
    }
    const why = illegal(input.action, s.status);
    if (why) throw new AppError(409, 'conflict', why);

    if (input.action === 'request') {
      const chosen = [...new Set(input.reviewers ?? [])];
      if (chosen.includes(actor.userId)) throw fieldError('reviewers', 'You cannot review your own study; choose someone else.');
      const members = await tx
        .select({ userId: memberships.userId, role: memberships.role })
        .from(memberships)
        .where(and(eq(memberships.teamId, actor.teamId), inArray(memberships.userId, chosen)));
      if (members.length !== chosen.length) throw fieldError('reviewers', 'Every reviewer must be a member of your team.');
      if (members.some((m) => m.role === 'viewer')) throw fieldError('reviewers', 'Viewers cannot review; choose a reviewer, engineer or owner.');
      const rev = await ensureRevision(tx, s);
      await tx
        .update(studies)
        .set({ status: 'in-review', reviewRequestedBy: actor.userId, reviewers: chosen, reviewRevision: rev.number, approvedRevision: null })
        .where(eq(studies.id, id));
      await tx.insert(reviewEvents).values({
        studyId: id,
        teamId: actor.teamId,
        actorId: actor.userId,
        action: 'request',
        fromStatus: s.status,
        toStatus: 'in-review',
        revision: rev.number,
        reviewers: chosen,
        message: input.message ?? '',
      });
      await recordAudit(tx, { teamId: actor.teamId, actorId: actor.userId, action: 'review.request', studyId: id, detail: { revision: rev.number, reviewers: chosen } });
      return { name: s.name, revision: rev.number, notifyIds: chosen, risk: await riskOf(tx, id, rev.number) };
    }

    // approve or request-changes
    const reviewRevision = s.reviewRevision!;
    const isChosen = s.reviewers.includes(actor.userId);
    if (!isChosen && actor.role !== 'owner') {
      throw new AppError(403, 'forbidden', 'Only the reviewers chosen for this study, or an owner, can approve it or request changes.');
    }
    const reviewed = await getRevision(tx, id, reviewRevision);
    const revisionAuthor = reviewed.author.id;
    const risk = revisionRisk(reviewed.number, reviewed.summary, reviewed.content.circuit);
    if (actor.userId === s.reviewRequestedBy || actor.userId === revisionAuthor) {
      throw new AppError(
        403,
        'forbidden',
        input.action === 'approve' ? 'You cannot approve your own study; another reviewer or owner must.' : 'You cannot request changes on your own study.',
      );
    }
    if (input.revision !== undefined && input.revision !== reviewRevision) {
      throw new AppError(409, 'conflict', `Revision ${reviewRevision} is under review, not revision ${input.revision}; reload the study.`);
    }
    // Sign-off knows the danger: a revision with violations is approved only when the approver says so.
    const acknowledged = input.action === 'approve' && risk.violationCount > 0 ? risk.violationCount : null;
    if (acknowledged !== null && input.acknowledgeViolations !== true) {
      throw fieldError(
        'acknowledgeViolations',
        `${riskSentence(risk)} Acknowledge the ${risk.violationCount === 1 ? 'violation' : 'violations'} to approve this revision anyway.`,
      );
    }
    const toStatus: StudyStatus = input.action === 'approve' ? 'approved' : 'changes-requested';
    await tx
      .update(studies)
      .set({ status: toStatus, approvedRevision: input.action === 'approve' ? reviewRevision : null })
      .where(eq(studies.id, id));
    await tx.insert(reviewEvents).values({
      studyId: id,
      teamId: actor.teamId,
      actorId: actor.userId,
      action: input.action,
      fromStatus: s.status,
      toStatus,
      revision: reviewRevision,
      reviewers: s.reviewers,
      message: input.message ?? '',
      acknowledgedViolations: acknowledged,
    });
    await recordAudit(tx, {
      teamId: actor.teamId,
      actorId: actor.userId,
      action: input.action === 'approve' ? 'review.approve' : 'review.request-changes',
      studyId: id,
      detail: { revision: reviewRevision, ...(acknowledged !== null ? { violations: acknowledged } : {}) },
    });
    return { name: s.name, revision: reviewRevision, notifyIds: [...new Set([s.reviewRequestedBy!, revisionAuthor])], risk };
  });

  const to = await recipients(db, outcome.notifyIds);
  const link = studyLink(appUrl, id);
  const base = { teamId: actor.teamId, studyId: id, actorId: actor.userId, recipients: to, quote: input.message || undefined, link };
  // Review and approval mail state the revision's violations (count and the worst one) beside the caution.
  const danger = outcome.risk ? [riskSentence(outcome.risk)] : [];
  if (input.action === 'request') {
    await notify(db, mailer, {
      ...base,
      kind: 'review-requested',
      text: `${actor.name} asks you to review "${outcome.name}" (revision ${outcome.revision}).`,
      subject: `Review requested: ${outcome.name}`,
      details: danger,
    });
  } else if (input.action === 'approve') {
    const ack = outcome.risk && outcome.risk.violationCount > 0 ? ` acknowledging ${outcome.risk.violationCount} violation${outcome.risk.violationCount === 1 ? '' : 's'}` : '';
    await notify(db, mailer, {
      ...base,
      kind: 'approved',
      text: `${actor.name} approved "${outcome.name}" (revision ${outcome.revision})${ack}.`,
      subject: `Approved: ${outcome.name}`,
      details: danger,
    });
  } else {
    await notify(db, mailer, {
      ...base,
      kind: 'changes-requested',
      text: `${actor.name} requested changes to "${outcome.name}" (revision ${outcome.revision}).`,
      subject: `Changes requested: ${outcome.name}`,
    });
  }
  return getReviewState(db, actor, id);
}
