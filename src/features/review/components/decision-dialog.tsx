import { useId, useState } from 'react';
import type { RevisionRisk } from '../../../../shared/review/risk.ts';
import { Button } from '../../../components/button.tsx';
import { Dialog } from '../../../components/dialog.tsx';
import { TextAreaField } from '../../../components/field.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { useReviewAction } from '../api/review-action.ts';
import { RiskNotice } from '../../../components/risk-notice.tsx';

/**
 * Approve or request changes on the revision under review; a request for changes must say what
 * should change. The dialog states the revision's violations (count and the worst one) with the
 * caution; approving a revision with violations needs the approver to acknowledge them (the
 * server refuses the approval otherwise and records the acknowledgement in the review).
 */
export function DecisionDialog({
  studyId,
  kind,
  revision,
  risk,
  open,
  onClose,
}: {
  studyId: string;
  kind: 'approve' | 'request-changes';
  revision: number;
  risk?: RevisionRisk | null;
  open: boolean;
  onClose: () => void;
}) {
  const action = useReviewAction(studyId);
  const [message, setMessage] = useState('');
  const [tried, setTried] = useState(false);
  const [acknowledged, setAcknowledged] = useState(false);
  const approve = kind === 'approve';
  const missing = !approve && message.trim() === '';
  const mustAcknowledge = approve && risk !== null && risk !== undefined && risk.revision === revision && risk.violationCount > 0;
  const unacknowledged = mustAcknowledge && !acknowledged;
  const serverAck = isApiError(action.error) ? action.error.fields.acknowledgeViolations : undefined;
  // The server may know of violations the page has not loaded yet: then the box appears with its answer.
  const showAck = mustAcknowledge || serverAck !== undefined;
  const formErrorId = useId();
  // The server's refusal of the whole decision (not of one field): the form's own error, in its words.
  const formError = action.isError && !serverAck && !(isApiError(action.error) && action.error.fields.message) ? action.error.message : null;
  const what = mustAcknowledge ? (risk!.violationCount === 1 ? 'violation' : `${risk!.violationCount} violations`) : 'violations';
  return (
    <Dialog
      open={open}
      title={approve ? `Approve revision ${revision}?` : `Request changes to revision ${revision}`}
      description={approve ? 'The approval is bound to this revision; any later edit returns the study to draft.' : 'The author gets an e-mail and a notification with your message.'}
      onClose={onClose}
      width="max-w-lg"
    >
      <form
        className="flex flex-col gap-3"
        aria-describedby={formError ? formErrorId : undefined}
        onSubmit={(e) => {
          e.preventDefault();
          setTried(true);
          if (missing || unacknowledged) return;
          action.mutate(
            { action: kind, message: message.trim() || undefined, revision, ...(approve && acknowledged ? { acknowledgeViolations: true } : {}) },
            { onSuccess: onClose },
          );
        }}
      >
        {risk && risk.revision === revision ? <RiskNotice risk={risk} /> : null}
        {showAck ? (
          <div className="flex flex-col gap-1">
            <label className="flex items-start gap-2 text-[13px]">
              <input
                type="checkbox"
                className="mt-0.5"
                checked={acknowledged}
                onChange={(e) => setAcknowledged(e.target.checked)}
                aria-invalid={tried && unacknowledged ? true : undefined}
                aria-describedby="ack-error"
              />
              <span>
                I have read the {what} of revision {revision} and approve it anyway; the acknowledgement is recorded in the review.
              </span>
            </label>
            {(tried && unacknowledged) || serverAck ? (
              <p id="ack-error" role="alert" className="text-[12px] text-danger">
                <span aria-hidden="true">✕ </span>
                {serverAck ?? 'Acknowledge the violations to approve this revision, or request changes instead.'}
              </p>
            ) : null}
          </div>
        ) : null}
        <TextAreaField
          label={approve ? 'Message (optional)' : 'What should change'}
          value={message}
          onChange={(e) => setMessage(e.target.value)}
          maxLength={5000}
          aria-required={!approve}
          error={tried && missing ? 'Say what should change' : isApiError(action.error) ? action.error.fields.message : undefined}
        />
        {formError ? (
          <p id={formErrorId} role="alert" className="text-[13px] text-danger">
            <span aria-hidden="true">✕ </span>
            {formError}
          </p>
        ) : null}
        <div className="flex justify-end gap-2">
          <Button onClick={onClose}>Cancel</Button>
          <Button type="submit" variant={approve ? 'primary' : 'danger'} busy={action.isPending} busyText="Sending…">
            {approve ? 'Approve' : 'Request changes'}
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
