import { isRouteErrorResponse, Link, useRouteError } from 'react-router';
import { isApiError } from '../lib/api-client.ts';
import { buttonClass } from './button.tsx';

/** Shown in place of a route whose loader or render failed; the rest of the app keeps working. */
export function RouteError() {
  const error = useRouteError();
  let title = 'Something went wrong on this page';
  let detail = 'An unexpected error stopped this page from showing. Reload to try again; if it keeps happening, tell whoever runs this Wyeward server.';
  if (isApiError(error, 404) || (isRouteErrorResponse(error) && error.status === 404)) {
    title = 'Not found';
    detail = 'There is nothing here, or it belongs to another team.';
  } else if (isApiError(error)) {
    detail = error.message;
  } else if (isRouteErrorResponse(error)) {
    detail = `${error.status} ${error.statusText}`;
  } else if (error instanceof Error && /dynamically imported module|Importing a module script failed/i.test(error.message)) {
    title = 'Wyeward was updated';
    detail = 'This page needs a newer copy of the app. Reload the page to fetch it.';
  }
  if (!isApiError(error) && !isRouteErrorResponse(error)) console.error(error);
  return (
    <div role="alert" className="mx-auto max-w-xl px-6 py-12">
      <h1 className="text-lg">{title}</h1>
      <p className="mt-2 text-sm text-ink-muted">{detail}</p>
      <div className="mt-4 flex gap-2">
        <Link to="/" className={buttonClass('primary')}>
          Go to studies
        </Link>
        <button type="button" className={buttonClass('secondary')} onClick={() => window.location.reload()}>
          Reload page
        </button>
      </div>
    </div>
  );
}
