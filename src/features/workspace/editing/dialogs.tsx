/** The workspace's dialogs: save with a message, a version conflict with a clear choice, leaving with unsaved changes, shortcut help. */
import { useState } from 'react';
import type { StudyDetail } from '../../../../shared/api/studies.ts';
import { Button } from '../../../components/button.tsx';
import { Dialog } from '../../../components/dialog.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import { SHORTCUTS } from './shortcuts.ts';

export function SaveDialog({ open, busy, error, onCancel, onSave }: { open: boolean; busy: boolean; error?: string; onCancel: () => void; onSave: (message: string) => void }) {
  const [message, setMessage] = useState('');
  return (
    <Dialog open={open} title="Save study" description="Saves a new version for the team. A short message helps reviewers." onClose={onCancel}>
      <form
        onSubmit={(e) => {
          e.preventDefault();
          onSave(message.trim());
        }}
      >
        <label htmlFor="save-message" className="text-[13px] font-semibold">
          Message (optional)
        </label>
        <input id="save-message" data-autofocus value={message} maxLength={500} onChange={(e) => setMessage(e.target.value)} className="mt-1 h-8 w-full rounded-[3px] border border-rule-strong bg-panel px-2 text-sm" placeholder="e.g. opened the service neutral" />
        {error ? (
          <p role="alert" className="mt-2 text-[13px] text-danger">
            <span aria-hidden="true">✕ </span>
            {error}
          </p>
        ) : null}
        <div className="mt-4 flex justify-end gap-2">
          <Button onClick={onCancel}>Cancel</Button>
          <Button type="submit" variant="primary" busy={busy} busyText="Saving…">
            Save
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

export interface ConflictSummary {
  added: string[];
  removed: string[];
  changed: string[];
}

/** Someone saved first: show what they saved and let the user choose; nothing is overwritten unasked. */
export function ConflictDialog({ theirs, diff, busy, onLoadTheirs, onOverwrite, onCancel }: { theirs: StudyDetail | null; diff: ConflictSummary; busy: boolean; onLoadTheirs: () => void; onOverwrite: () => void; onCancel: () => void }) {
  const list = (label: string, ids: string[]) =>
    ids.length > 0 ? (
      <li>
        {label}: <span className="num">{ids.join(', ')}</span>
      </li>
    ) : null;
  return (
    <Dialog open={theirs !== null} title="Someone saved this study while you were editing" onClose={onCancel} width="max-w-lg">
      {theirs ? (
        <div className="text-sm">
          <p>
            <span className="font-semibold">{theirs.updatedBy.name}</span> saved{theirs.revision ? <> revision <span className="num">{theirs.revision}</span></> : null} at{' '}
            <time className="num">{formatDateTime(theirs.updatedAt)}</time>. Compared with your diagram, their version has:
          </p>
          <ul className="mt-2 list-disc pl-5 text-[13px]">
            {list('elements only in theirs', diff.added)}
            {list('elements only in yours', diff.removed)}
            {list('elements that differ', diff.changed)}
            {diff.added.length + diff.removed.length + diff.changed.length === 0 ? <li>the same elements (layout or settings may differ)</li> : null}
          </ul>
          <p className="mt-2 text-[13px] text-ink-muted">Choose one. Loading theirs discards your unsaved edits; saving yours replaces their version with a new one on top of it (theirs stays in the history).</p>
          <div className="mt-4 flex flex-wrap justify-end gap-2">
            <Button onClick={onCancel}>Keep editing</Button>
            <Button onClick={onLoadTheirs}>Load their version</Button>
            <Button variant="danger" busy={busy} busyText="Saving…" onClick={onOverwrite}>
              Save mine over theirs
            </Button>
          </div>
        </div>
      ) : null}
    </Dialog>
  );
}

export function LeaveDialog({ open, onStay, onLeave }: { open: boolean; onStay: () => void; onLeave: () => void }) {
  return (
    <Dialog open={open} title="Leave without saving?" onClose={onStay}>
      <p className="text-sm">The diagram has changes that are not saved. They will be lost.</p>
      <div className="mt-4 flex justify-end gap-2">
        <Button onClick={onStay} data-autofocus>
          Stay
        </Button>
        <Button variant="danger" onClick={onLeave}>
          Leave and discard
        </Button>
      </div>
    </Dialog>
  );
}

export function ShortcutsDialog({ open, onClose }: { open: boolean; onClose: () => void }) {
  return (
    <Dialog open={open} title="Keyboard shortcuts" onClose={onClose} width="max-w-lg">
      <table className="w-full text-[13px]">
        <tbody>
          {SHORTCUTS.map((s) => (
            <tr key={s.keys} className="border-b border-rule last:border-0">
              <td className="num py-1 pr-3 align-top whitespace-nowrap">{s.keys}</td>
              <td className="py-1">{s.action}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <div className="mt-3 flex justify-end">
        <Button onClick={onClose} data-autofocus>
          Close
        </Button>
      </div>
    </Dialog>
  );
}
