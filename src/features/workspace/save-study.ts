/**
 * PATCH /api/studies/:id with the workspace's content and an optional message. The version sent is
 * the one the user edited; a stale one answers 409 `version-conflict` with the study as it is now,
 * which the page offers to load or to save over, never silently.
 */
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useCallback, useState } from 'react';
import type { StudyContent, StudyDetail } from '../../../shared/api/studies.ts';
import { conflictOf, patchStudy, studyPatched } from '../../lib/api/studies.ts';
import { docKey, docOf } from './model/conversion.ts';
import type { WorkspaceDoc } from './model/document.ts';

export { conflictOf };

export interface SaveStudyBody {
  version: number;
  content: StudyContent;
  /** Why this revision was saved; shown with the revision where the server keeps it. */
  message?: string;
}

/** Save mutation (the shared PATCH client); a success refreshes the cached study and the lists. */
export function useSaveStudy(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: SaveStudyBody) => patchStudy(id, body),
    onSuccess: (study) => studyPatched(queryClient, study),
  });
}

/**
 * Saving a workspace document: what was last saved (for the dirty mark), the version the user edits
 * from, and a conflict when someone else saved first (load theirs, or save mine over theirs).
 */
export function useStudySave(study: StudyDetail, content: (d: WorkspaceDoc) => StudyContent, onLoadTheirs: (doc: WorkspaceDoc) => void) {
  const save = useSaveStudy(study.id);
  const [savedKey, setSavedKey] = useState(() => docKey(docOf(study)));
  const [baseVersion, setBaseVersion] = useState(study.version);
  const [theirs, setTheirs] = useState<StudyDetail | null>(null);
  const [pendingMessage, setPendingMessage] = useState<string | undefined>(undefined);

  const { mutate: saveMutate } = save;
  const doSave = useCallback(
    (snapshot: WorkspaceDoc, message: string | undefined, version: number, onDone?: () => void) => {
      setPendingMessage(message);
      saveMutate(
        { version, content: content(snapshot), ...(message ? { message } : {}) },
        {
          onSuccess: (saved) => {
            setSavedKey(docKey(snapshot));
            setBaseVersion(saved.version);
            setTheirs(null);
            onDone?.();
          },
          onError: (e) => {
            const current = conflictOf(e);
            if (current) {
              setTheirs(current);
              onDone?.();
            }
          },
        },
      );
    },
    [saveMutate, content],
  );

  const loadTheirs = useCallback(() => {
    if (!theirs) return;
    const next = docOf(theirs);
    onLoadTheirs(next);
    setSavedKey(docKey(next));
    setBaseVersion(theirs.version);
    setTheirs(null);
  }, [theirs, onLoadTheirs]);

  return { save, savedKey, baseVersion, theirs, pendingMessage, doSave, loadTheirs, dismissConflict: () => setTheirs(null) };
}
