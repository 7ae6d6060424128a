import { useMemo } from 'react';
import { useComments } from './get-comments.ts';

/** Open threads per element id, for pins on the canvas (stable between renders while the comments are unchanged). */
export function useCommentPins(studyId: string): { elementId: string; count: number }[] {
  const comments = useComments(studyId);
  return useMemo(() => {
    const counts = new Map<string, number>();
    for (const c of comments.data?.items ?? []) {
      if (c.parentId !== null || c.resolved || c.deleted || !c.anchor || !('elementId' in c.anchor)) continue;
      counts.set(c.anchor.elementId, (counts.get(c.anchor.elementId) ?? 0) + 1);
    }
    return [...counts].map(([elementId, count]) => ({ elementId, count }));
  }, [comments.data]);
}
