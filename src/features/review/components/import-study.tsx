import { useRef, useState } from 'react';
import { useNavigate } from 'react-router';
import { Button } from '../../../components/button.tsx';
import { Dialog } from '../../../components/dialog.tsx';
import { TextField } from '../../../components/field.tsx';
import { Notice } from '../../../components/notice.tsx';
import { isApiError } from '../../../lib/api-client.ts';
import { useImportStudy } from '../api/transfer.ts';

/** Reads a chosen file as JSON; a file that is not JSON gets a plain message before anything is sent. */
async function readJson(file: File): Promise<{ ok: true; value: unknown } | { ok: false; message: string }> {
  const text = await file.text();
  try {
    return { ok: true, value: JSON.parse(text) };
  } catch {
    return { ok: false, message: `${file.name} is not a JSON file. Choose a .wyeward.json study file or a wyeward-circuit file.` };
  }
}

/** "Import study": upload a study file (or a bare circuit file) to make a new study; each problem is listed as the server words it ("element LOAD3: … must be a number"). */
export function ImportStudyButton() {
  const [open, setOpen] = useState(false);
  const [file, setFile] = useState<File | null>(null);
  const [name, setName] = useState('');
  const [readError, setReadError] = useState<string | null>(null);
  const input = useRef<HTMLInputElement>(null);
  const importStudy = useImportStudy();
  const navigate = useNavigate();
  const fields = isApiError(importStudy.error) ? Object.entries(importStudy.error.fields) : [];

  const close = () => {
    setOpen(false);
    setFile(null);
    setName('');
    setReadError(null);
    importStudy.reset();
  };

  return (
    <>
      <Button onClick={() => setOpen(true)}>Import study</Button>
      <Dialog open={open} title="Import a study" description="A .wyeward.json study file exported from Wyeward, or a bare wyeward-circuit file." onClose={close} width="max-w-lg">
        <form
          className="flex flex-col gap-3"
          onSubmit={async (e) => {
            e.preventDefault();
            setReadError(null);
            if (!file) {
              setReadError('Choose a file first.');
              return;
            }
            const parsed = await readJson(file);
            if (!parsed.ok) {
              setReadError(parsed.message);
              return;
            }
            importStudy.mutate({ file: parsed.value, name: name.trim() || undefined }, { onSuccess: (created) => { close(); navigate(`/studies/${created.id}`); } });
          }}
        >
          <label className="flex flex-col gap-1 text-[13px] font-semibold">
            Study file
            <input
              ref={input}
              type="file"
              accept=".json,application/json"
              className="text-[13px] font-normal file:mr-2 file:rounded-[3px] file:border file:border-rule-strong file:bg-panel file:px-2 file:py-1"
              onChange={(e) => {
                setFile(e.target.files?.[0] ?? null);
                setReadError(null);
                importStudy.reset();
              }}
            />
          </label>
          <TextField label="Name (optional)" hint="Leave empty to keep the name in the file." value={name} onChange={(e) => setName(e.target.value)} maxLength={200} />
          {readError ? <Notice tone="error">{readError}</Notice> : null}
          {importStudy.isError ? (
            <Notice tone="error" title={fields.length > 0 ? 'The file has problems:' : 'The study was not imported.'}>
              {fields.length > 0 ? (
                <ul aria-label="Problems in the file" className="list-disc pl-4">
                  {fields.map(([path, message]) => (
                    <li key={path}>{message}</li>
                  ))}
                </ul>
              ) : (
                importStudy.error.message
              )}
            </Notice>
          ) : null}
          <div className="flex justify-end gap-2">
            <Button onClick={close}>Cancel</Button>
            <Button type="submit" variant="primary" busy={importStudy.isPending} busyText="Importing…">
              Import
            </Button>
          </div>
        </form>
      </Dialog>
    </>
  );
}
