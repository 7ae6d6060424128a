import { Link } from 'react-router';
import { buttonClass } from '../../components/button.tsx';

export function NotFoundRoute() {
  return (
    <div className="mx-auto max-w-xl px-6 py-16">
      <p className="num text-[13px] text-ink-muted">HTTP 404</p>
      <h1 className="mt-1 text-lg">No page at this address</h1>
      <p className="mt-2 text-sm text-ink-muted">The link may be mistyped, or the page has moved.</p>
      <Link to="/" className={`${buttonClass('primary')} mt-4`}>
        Go to studies
      </Link>
    </div>
  );
}
