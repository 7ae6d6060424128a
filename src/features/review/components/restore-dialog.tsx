import { useState } from 'react';
import { Button } from '../../../components/button.tsx';
import { Dialog } from '../../../components/dialog.tsx';
import { TextField } from '../../../components/field.tsx';
import { Notice } from '../../../components/notice.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { useRestoreRevision } from '../api/restore-revision.ts';
import { useStudyRecord } from '../api/get-study-record.ts';

/** Asks for a message, then makes a new revision with the content of `n` against the version the user sees. */
export function RestoreDialog({ studyId, n, open, onClose, onRestored }: { studyId: string; n: number; open: boolean; onClose: () => void; onRestored?: (number: number) => void }) {
  const study = useStudyRecord(studyId);
  const restore = useRestoreRevision(studyId);
  const [message, setMessage] = useState('');
  const conflict = isApiError(restore.error, 409) && restore.error.code === 'version-conflict';
  return (
    <Dialog open={open} title={`Restore revision ${n}?`} description="A new revision is saved with this content; nothing in the history is lost." onClose={onClose}>
      <form
        className="flex flex-col gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          if (!study.data) return;
          restore.mutate(
            { n, version: study.data.version, message: message.trim() || undefined },
            {
              onSuccess: (saved) => {
                onClose();
                onRestored?.(saved.revision.number);
              },
            },
          );
        }}
      >
        <TextField label="Message (optional)" value={message} onChange={(e) => setMessage(e.target.value)} placeholder={`Restored revision ${n}`} maxLength={500} />
        {restore.isError ? (
          <Notice tone="error" title={conflict ? 'The study changed since you opened it.' : 'Could not restore.'}>
            {conflict ? 'The page now shows the latest version; check it, then restore again.' : restore.error.message}
          </Notice>
        ) : null}
        <div className="flex justify-end gap-2">
          <Button onClick={onClose}>Cancel</Button>
          <Button type="submit" variant="primary" busy={restore.isPending} busyText="Restoring…" disabled={!study.data}>
            Restore revision {n}
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
