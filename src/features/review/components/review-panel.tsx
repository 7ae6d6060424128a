import { useState } from 'react';
import { Link } from 'react-router';
import type { Role } from '../../../../shared/api/common.ts';
import { StatusBadge, TemplateBadge } from '../../../components/badges.tsx';
import { Button, buttonClass } from '../../../components/button.tsx';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { useLiveReview } from '../api/use-live-review.ts';
import { useRevisions } from '../api/get-revisions.ts';
import { useStudyRecord } from '../api/get-study-record.ts';
import { reportUrl, resultsCsvUrl } from '../api/report.ts';
import { exportUrl } from '../api/transfer.ts';
import { canRequestReview, canWrite, decisionBlocker, reviewDiffHref } from '../utils/permissions.ts';
import { DecisionDialog } from './decision-dialog.tsx';
import { RequestReviewDialog } from './request-review-dialog.tsx';
import { ReviewEvents } from './review-events.tsx';
import { RiskNotice } from '../../../components/risk-notice.tsx';
import { TemplateToggle } from './template-toggle.tsx';

const WHY_NOT: Record<string, string> = {
  author: 'You cannot approve your own study.',
  'not-chosen': 'You were not asked to review this revision.',
};

/** Status, the actions the member may take now, the approved revision, the review history, and links to history, diff and export. */
export function ReviewPanel({ studyId, role, userId }: { studyId: string; role: Role; userId: string }) {
  const review = useLiveReview(studyId);
  const study = useStudyRecord(studyId);
  const revisions = useRevisions(studyId);
  const [dialog, setDialog] = useState<null | 'request' | 'approve' | 'request-changes'>(null);

  if (review.isPending) return <Loading label="Loading the review…" />;
  if (review.isError) return <Notice tone="error" title="The review state could not be loaded.">{review.error.message}</Notice>;
  const state = review.data;
  const underReview = state.review?.revision ?? null;
  const revisionAuthor = underReview !== null ? (revisions.data?.items.find((r) => r.number === underReview)?.author.id ?? null) : null;
  const blocker = decisionBlocker(state, role, userId, revisionAuthor);
  const latest = revisions.data?.items[0]?.number ?? study.data?.revision ?? null;
  const lastApproval = [...state.events].reverse().find((e) => e.action === 'approve');
  const lastChanges = state.status === 'changes-requested' ? [...state.events].reverse().find((e) => e.action === 'request-changes') : undefined;

  return (
    <section aria-labelledby="review-title" className="flex flex-col gap-3 rounded-[4px] border border-rule bg-panel px-4 py-3">
      <div className="flex flex-wrap items-center gap-2">
        <h2 id="review-title" className="text-base">
          Review
        </h2>
        <StatusBadge status={state.status} />
        {study.data?.isTemplate ? <TemplateBadge /> : null}
      </div>

      {state.status === 'in-review' && state.review ? (
        <div className="rounded-[3px] border border-review/40 bg-review-soft px-3 py-2 text-sm">
          <p>
            <span className="font-semibold">{state.review.requestedBy.name}</span> asked{' '}
            {state.review.reviewers.map((r) => r.name).join(', ')} to review revision <span className="num">{state.review.revision}</span>.
          </p>
          <Link to={reviewDiffHref(studyId, state) ?? `/studies/${studyId}/diff`} className={`${buttonClass('primary')} mt-2`}>
            Read the changes in revision {state.review.revision}
          </Link>
        </div>
      ) : null}
      {state.status === 'in-review' && state.risk ? <RiskNotice risk={state.risk} compact /> : null}

      {lastChanges ? (
        <div className="rounded-[3px] border border-caution/40 bg-caution-soft px-3 py-2 text-sm">
          <p>
            <span className="font-semibold">{lastChanges.actor.name}</span> requested changes to revision <span className="num">{lastChanges.revision}</span>:
          </p>
          <p className="mt-0.5 whitespace-pre-wrap break-words">{lastChanges.message}</p>
        </div>
      ) : null}

      {state.status === 'approved' && state.approvedRevision !== null ? (
        <p className="rounded-[3px] border border-ok/40 bg-ok-soft px-3 py-2 text-sm">
          <span aria-hidden="true">✓ </span>Approved revision <span className="num">{state.approvedRevision}</span>
          {lastApproval ? (
            <>
              {' '}
              by <span className="font-semibold">{lastApproval.actor.name}</span>, <time dateTime={lastApproval.at}>{formatDateTime(lastApproval.at)}</time>
            </>
          ) : null}
          .
        </p>
      ) : null}
      {state.status === 'draft' && lastApproval && lastApproval.revision !== null ? (
        <p className="text-[13px] text-ink-muted">
          Revision <span className="num">{lastApproval.revision}</span> was approved by {lastApproval.actor.name}; the study has changed since.
        </p>
      ) : null}

      <div className="flex flex-wrap gap-2">
        {canRequestReview(role, state.status) ? (
          <Button variant="primary" onClick={() => setDialog('request')}>
            {state.status === 'changes-requested' ? 'Request review again' : 'Request review'}
          </Button>
        ) : null}
        {blocker === null && underReview !== null ? (
          <>
            <Button variant="primary" onClick={() => setDialog('approve')}>
              Approve
            </Button>
            <Button variant="danger" onClick={() => setDialog('request-changes')}>
              Request changes
            </Button>
          </>
        ) : null}
      </div>
      {state.status === 'in-review' && blocker && WHY_NOT[blocker] ? <p className="text-[12px] text-ink-muted">{WHY_NOT[blocker]}</p> : null}
      {study.data && canWrite(role) ? <TemplateToggle study={study.data} /> : null}

      <div className="flex flex-wrap gap-x-3 gap-y-1 border-t border-rule pt-2 text-[13px]">
        <Link to={`/studies/${studyId}/history`} className="font-semibold text-accent hover:underline">
          History{latest !== null ? ` (${latest} revision${latest === 1 ? '' : 's'})` : ''}
        </Link>
        {latest !== null && latest > 1 ? (
          <Link to={`/studies/${studyId}/diff`} className="font-semibold text-accent hover:underline">
            Compare revisions
          </Link>
        ) : null}
        <a href={exportUrl(studyId)} download className="font-semibold text-accent hover:underline">
          Export study file
        </a>
        {latest !== null ? (
          <>
            <a href={reportUrl(studyId, { revision: latest })} download className="font-semibold text-accent hover:underline">
              Report (PDF)
            </a>
            <a href={reportUrl(studyId, { revision: latest, units: 'pu' })} download className="font-semibold text-accent hover:underline">
              Report in per unit (PDF)
            </a>
            <Link to={`/studies/${studyId}/print/${latest}`} className="font-semibold text-accent hover:underline">
              Print view
            </Link>
            <span className="text-ink-muted">
              Saved results as CSV:{' '}
              {(['buses', 'loads', 'elements', 'flags'] as const).map((t, i) => (
                <span key={t}>
                  {i ? ', ' : ''}
                  <a href={resultsCsvUrl(studyId, t, { revision: latest })} download aria-label={`Saved ${t} results as CSV`} className="font-semibold text-accent hover:underline">
                    {t}
                  </a>
                </span>
              ))}
            </span>
          </>
        ) : null}
      </div>

      <div className="border-t border-rule pt-2">
        <h3 className="mb-1 text-[12px] font-semibold uppercase tracking-wide text-ink-muted">Review history</h3>
        <ReviewEvents events={state.events} />
      </div>

      {dialog === 'request' ? (
        <RequestReviewDialog studyId={studyId} selfId={userId} open onClose={() => setDialog(null)} again={state.review?.reviewers.map((r) => r.id)} />
      ) : null}
      {(dialog === 'approve' || dialog === 'request-changes') && underReview !== null ? (
        <DecisionDialog studyId={studyId} kind={dialog} revision={underReview} risk={state.risk} open onClose={() => setDialog(null)} />
      ) : null}
    </section>
  );
}
