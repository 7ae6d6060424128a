/**
 * Query keys of a study's review data. They extend the studies feature's `['studies', 'detail', id]`
 * (same cache, api.md), so invalidating that prefix refreshes the study with its history, review,
 * comments and files together after any change.
 */
export const reviewKeys = {
  study: (id: string) => ['studies', 'detail', id] as const,
  revisions: (id: string) => ['studies', 'detail', id, 'revisions'] as const,
  revision: (id: string, n: number) => ['studies', 'detail', id, 'revisions', n] as const,
  diff: (id: string, from?: number, to?: number) => ['studies', 'detail', id, 'diff', { from: from ?? null, to: to ?? null }] as const,
  review: (id: string) => ['studies', 'detail', id, 'review'] as const,
  comments: (id: string) => ['studies', 'detail', id, 'comments'] as const,
  attachments: (id: string) => ['studies', 'detail', id, 'attachments'] as const,
  templates: () => ['studies', 'templates'] as const,
  members: () => ['team', 'overview'] as const,
};

/** `/api/studies/<id>` with the id escaped. */
export function studyPath(id: string): string {
  return `/api/studies/${encodeURIComponent(id)}`;
}
