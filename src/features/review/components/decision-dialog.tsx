import { useState } from 'react';
import { Button } from '../../../components/button.tsx';
import { Dialog } from '../../../components/dialog.tsx';
import { TextAreaField } from '../../../components/field.tsx';
import { Notice } from '../../../components/notice.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { useReviewAction } from '../api/review-action.ts';

/** Approve or request changes on the revision under review; a request for changes must say what should change. */
export function DecisionDialog({ studyId, kind, revision, open, onClose }: { studyId: string; kind: 'approve' | 'request-changes'; revision: number; open: boolean; onClose: () => void }) {
  const action = useReviewAction(studyId);
  const [message, setMessage] = useState('');
  const [tried, setTried] = useState(false);
  const approve = kind === 'approve';
  const missing = !approve && message.trim() === '';
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
        onSubmit={(e) => {
          e.preventDefault();
          setTried(true);
          if (missing) return;
          action.mutate({ action: kind, message: message.trim() || undefined, revision }, { onSuccess: onClose });
        }}
      >
        <TextAreaField
          label={approve ? 'Message (optional)' : 'What should change'}
          value={message}
          onChange={(e) => setMessage(e.target.value)}
          maxLength={5000}
          aria-required={!approve}
          error={tried && missing ? 'Say what should change' : isApiError(action.error) ? action.error.fields.message : undefined}
        />
        {action.isError ? <Notice tone="error" title={approve ? 'Could not approve.' : 'Could not request changes.'}>{action.error.message}</Notice> : null}
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
