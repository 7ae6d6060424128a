import type { RevisionSummary } from '../../../../shared/api/revisions.ts';
import { plural } from '../../../lib/format.ts';

/** A revision's solve outcome in a few words: "Solved · 2 flags (1 violation)" or the engine's error. */
export function RevisionResults({ results }: { results: RevisionSummary['results'] }) {
  if (!results.ok) {
    return (
      <span className="text-danger">
        <span aria-hidden="true">✕ </span>Does not solve: {results.error.message}
      </span>
    );
  }
  return (
    <span>
      <span aria-hidden="true" className="text-ok">
        ✓{' '}
      </span>
      Solved · {plural(results.flagCount, 'flag')}
      {results.violationCount > 0 ? ` (${plural(results.violationCount, 'violation')})` : ''}
    </span>
  );
}
