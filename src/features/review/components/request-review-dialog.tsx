import { useState } from 'react';
import { MAX_REVIEWERS } from '../../../../shared/api/review.ts';
import { Button } from '../../../components/button.tsx';
import { Dialog } from '../../../components/dialog.tsx';
import { TextAreaField } from '../../../components/field.tsx';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { ROLE_LABEL } from '../../../lib/authorization.ts';
import { useMembers } from '../api/get-members.ts';
import { useReviewAction } from '../api/review-action.ts';
import { reviewerCandidates } from '../utils/permissions.ts';

/** Choose reviewers among team members (reviewer, engineer, owner; never yourself) and add a message. */
export function RequestReviewDialog({ studyId, selfId, open, onClose, again }: { studyId: string; selfId: string; open: boolean; onClose: () => void; again?: string[] }) {
  const members = useMembers();
  const action = useReviewAction(studyId);
  const [chosen, setChosen] = useState<string[]>((again ?? []).filter((id) => id !== selfId));
  const [message, setMessage] = useState('');
  const candidates = members.data ? reviewerCandidates(members.data.members, selfId) : [];
  const fieldError = isApiError(action.error) ? action.error.fields.reviewers : undefined;
  const localError = chosen.length === 0 ? 'Choose at least one reviewer' : chosen.length > MAX_REVIEWERS ? `At most ${MAX_REVIEWERS} reviewers` : null;
  const [tried, setTried] = useState(false);

  return (
    <Dialog open={open} title="Request review" description="The chosen reviewers get an e-mail and a notification with a link to the changes." onClose={onClose} width="max-w-lg">
      <form
        className="flex flex-col gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          setTried(true);
          if (localError) return;
          action.mutate({ action: 'request', reviewers: chosen, message: message.trim() || undefined }, { onSuccess: onClose });
        }}
      >
        <fieldset className="flex flex-col gap-1" aria-describedby={tried && (localError || fieldError) ? 'reviewers-error' : undefined}>
          <legend className="mb-1 text-[13px] font-semibold">Reviewers</legend>
          {members.isPending ? <Loading label="Loading the team…" /> : null}
          {members.isError ? <Notice tone="error">{members.error.message}</Notice> : null}
          {members.data && candidates.length === 0 ? <p className="text-[13px] text-ink-muted">Nobody else in the team may review. Invite a reviewer from the Team page.</p> : null}
          {candidates.map((m) => (
            <label key={m.userId} className="flex items-center gap-2 text-sm">
              <input
                type="checkbox"
                checked={chosen.includes(m.userId)}
                onChange={(e) => setChosen((prev) => (e.target.checked ? [...prev, m.userId] : prev.filter((x) => x !== m.userId)))}
              />
              <span>{m.name}</span>
              <span className="text-[12px] text-ink-muted">{ROLE_LABEL[m.role]}</span>
            </label>
          ))}
          {tried && (localError || fieldError) ? (
            <p id="reviewers-error" role="alert" className="text-[13px] text-danger">
              <span aria-hidden="true">✕ </span>
              {localError ?? fieldError}
            </p>
          ) : null}
        </fieldset>
        <TextAreaField label="Message to the reviewers (optional)" value={message} onChange={(e) => setMessage(e.target.value)} maxLength={5000} />
        {action.isError && !fieldError ? <Notice tone="error" title="The review could not be requested.">{action.error.message}</Notice> : null}
        <div className="flex justify-end gap-2">
          <Button onClick={onClose}>Cancel</Button>
          <Button type="submit" variant="primary" busy={action.isPending} busyText="Sending…">
            Send request
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
