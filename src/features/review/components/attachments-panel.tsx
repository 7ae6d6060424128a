import { useRef, useState } from 'react';
import type { Role } from '../../../../shared/api/common.ts';
import { ATTACHMENT_MAX_BYTES, ATTACHMENT_TYPES, type Attachment } from '../../../../shared/api/attachments.ts';
import { Button } from '../../../components/button.tsx';
import { ConfirmDialog } from '../../../components/dialog.tsx';
import { Loading } from '../../../components/loading.tsx';
import { Notice } from '../../../components/notice.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { formatDateTime } from '../../../lib/format.ts';
import { attachmentUrl, useAttachments, useDeleteAttachment, useUploadAttachment } from '../api/attachments.ts';
import { canComment, canWrite } from '../utils/permissions.ts';

const ACCEPT = Object.values(ATTACHMENT_TYPES)
  .flat()
  .map((e) => `.${e}`)
  .join(',');

/** Bytes in words: "812 B", "14.2 KB", "3.4 MB" (binary multiples, as the 10 MB limit is). */
export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${(n / 1024).toFixed(1)} KB`;
  return `${(n / 1024 / 1024).toFixed(1)} MB`;
}

/** The upload error in plain words: the limits for 413 and 415, the server's message otherwise. */
export function uploadErrorText(error: unknown): string {
  if (isApiError(error, 413)) return `The file is too large: at most 10 MB. ${error.message}`.trim();
  if (isApiError(error, 415)) return `That type of file is not accepted: upload a PDF, PNG, JPEG or CSV whose content matches its name. ${error.message}`.trim();
  if (isApiError(error) && error.fields.file) return error.fields.file;
  return error instanceof Error ? error.message : 'The upload failed.';
}

/** Files on a study: upload (PDF, PNG, JPEG, CSV up to 10 MB), list, download, delete. */
export function AttachmentsPanel({ studyId, role, userId }: { studyId: string; role: Role; userId: string }) {
  const list = useAttachments(studyId);
  const upload = useUploadAttachment(studyId);
  const remove = useDeleteAttachment(studyId);
  const input = useRef<HTMLInputElement>(null);
  const [localError, setLocalError] = useState<string | null>(null);
  const [toDelete, setToDelete] = useState<Attachment | null>(null);

  return (
    <section aria-labelledby="files-title" className="flex flex-col gap-2 rounded-[4px] border border-rule bg-panel px-4 py-3">
      <h2 id="files-title" className="text-base">
        Files
      </h2>
      {canComment(role) ? (
        <div className="flex flex-col gap-1">
          <label className="flex flex-col gap-1 text-[13px] font-semibold">
            Attach a file
            <input
              ref={input}
              type="file"
              accept={ACCEPT}
              className="text-[13px] font-normal file:mr-2 file:rounded-[3px] file:border file:border-rule-strong file:bg-panel file:px-2 file:py-1"
              onChange={(e) => {
                const file = e.target.files?.[0];
                setLocalError(null);
                upload.reset();
                if (!file) return;
                // Checked here to spare a 10 MB upload that would be refused; the server checks again.
                if (file.size > ATTACHMENT_MAX_BYTES) {
                  setLocalError(`The file is too large: ${formatBytes(file.size)}, at most 10 MB.`);
                  e.target.value = '';
                  return;
                }
                upload.mutate(file, { onSettled: () => { if (input.current) input.current.value = ''; } });
              }}
            />
          </label>
          <p className="text-[12px] text-ink-muted">PDF, PNG, JPEG or CSV, at most 10 MB.</p>
          {upload.isPending ? <p role="status" className="text-[13px]">Uploading…</p> : null}
          {localError || upload.isError ? (
            <Notice tone="error" title="The file was not attached.">
              {localError ?? uploadErrorText(upload.error)}
            </Notice>
          ) : null}
        </div>
      ) : null}
      {list.isPending ? <Loading label="Loading files…" /> : null}
      {list.isError ? <Notice tone="error" title="Files could not be listed.">{list.error.message}</Notice> : null}
      {list.data && list.data.items.length === 0 ? <p className="text-[13px] text-ink-muted">No files attached.</p> : null}
      {list.data && list.data.items.length > 0 ? (
        <ul aria-label="Attached files" className="flex flex-col divide-y divide-rule text-[13px]">
          {list.data.items.map((a) => (
            <li key={a.id} className="flex flex-wrap items-center gap-x-3 gap-y-0.5 py-1.5">
              <a href={attachmentUrl(studyId, a.id)} download={a.fileName} className="font-semibold break-all text-accent hover:underline">
                {a.fileName}
              </a>
              <span className="num text-ink-muted">{formatBytes(a.size)}</span>
              <span className="text-ink-muted">
                {a.uploadedBy.name}, <time dateTime={a.createdAt}>{formatDateTime(a.createdAt)}</time>
              </span>
              {a.uploadedBy.id === userId || canWrite(role) ? (
                <Button size="sm" variant="ghost" className="ml-auto" aria-label={`Delete ${a.fileName}`} onClick={() => { remove.reset(); setToDelete(a); }}>
                  Delete
                </Button>
              ) : null}
            </li>
          ))}
        </ul>
      ) : null}
      <ConfirmDialog
        open={toDelete !== null}
        title="Delete this file?"
        confirmLabel="Delete file"
        busy={remove.isPending}
        error={remove.error?.message}
        onCancel={() => setToDelete(null)}
        onConfirm={() => toDelete && remove.mutate(toDelete.id, { onSuccess: () => setToDelete(null) })}
      >
        <p>
          “<span className="font-semibold">{toDelete?.fileName}</span>” will be removed from the study.
        </p>
      </ConfirmDialog>
    </section>
  );
}
