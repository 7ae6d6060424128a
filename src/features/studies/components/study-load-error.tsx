import { Link } from 'react-router';
import { Notice } from '../../../components/notice.tsx';
import { isApiError } from '../../../lib/api-client.ts';

/** Why a study could not be shown: not found (deleted, or another team's — never said which) or another failure. */
export function StudyLoadError({ error }: { error: Error }) {
  return (
    <div className="mx-auto max-w-3xl">
      {isApiError(error, 404) ? (
        <Notice tone="error" title="Study not found.">
          It may have been deleted, or it belongs to another team. <Link to="/" className="font-semibold text-accent underline">Back to studies</Link>
        </Notice>
      ) : (
        <Notice tone="error" title="The study could not be loaded.">
          {error.message}
        </Notice>
      )}
    </div>
  );
}
