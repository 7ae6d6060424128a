/**
 * PATCH /api/studies/:id with the workspace's content and an optional message. The version sent is
 * the one the user edited; a stale one answers 409 `version-conflict` with the study as it is now,
 * which the page offers to load or to save over, never silently.
 */
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useCallback, useState } from 'react';
import { docKey, docOf } from './model/conversion.ts';
import type { WorkspaceDoc } from './model/document.ts';
import { versionConflictBodySchema, type StudyContent, type StudyDetail } from '../../../shared/api/studies.ts';
import { api, isApiError } from '../../lib/api-client.ts';

export interface SaveStudyBody {
  version: number;
  content: StudyContent;
  /** Why this revision was saved; shown with the revision where the server keeps it. */
  message?: string;
}

/** Sends the save. */
export function saveStudy(id: string, body: SaveStudyBody): Promise<StudyDetail> {
  return api.patch<StudyDetail>(`/api/studies/${encodeURIComponent(id)}`, body);
}

/** The study as saved by someone else, when `error` is a version conflict; otherwise null. */
export function conflictOf(error: unknown): StudyDetail | null {
  if (!isApiError(error, 409) || error.code !== 'version-conflict') return null;
  const parsed = versionConflictBodySchema.safeParse(error.body);
  return parsed.success ? parsed.data.current : null;
}

/** Save mutation; a success refreshes the cached study (same keys as the studies feature's queries). */
export function useSaveStudy(id: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: SaveStudyBody) => saveStudy(id, body),
    onSuccess: (study) => {
      queryClient.setQueryData(['studies', 'detail', id], study);
      return queryClient.invalidateQueries({ queryKey: ['studies', 'list'] });
    },
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

  const doSave = useCallback(
    (snapshot: WorkspaceDoc, message: string | undefined, version: number, onDone?: () => void) => {
      setPendingMessage(message);
      save.mutate(
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
    [save, content],
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
