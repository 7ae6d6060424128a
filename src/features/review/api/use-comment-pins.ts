import { useMemo } from 'react';
import { PRIVATE_MARK } from '../../../../shared/review/user-names.ts';
import { useComments } from './get-comments.ts';

/**
 * Open threads per element id, for pins on the canvas (stable between renders while the comments
 * are unchanged). A thread anchored to the hidden switch of an opened connection pins on the
 * element the user drew (the part of the id before the private marker).
 */
export function useCommentPins(studyId: string): { elementId: string; count: number }[] {
  const comments = useComments(studyId);
  return useMemo(() => {
    const counts = new Map<string, number>();
    for (const c of comments.data?.items ?? []) {
      if (c.parentId !== null || c.resolved || c.deleted || !c.anchor || !('elementId' in c.anchor)) continue;
      const id = c.anchor.elementId.split(PRIVATE_MARK)[0];
      counts.set(id, (counts.get(id) ?? 0) + 1);
    }
    return [...counts].map(([elementId, count]) => ({ elementId, count }));
  }, [comments.data]);
}
