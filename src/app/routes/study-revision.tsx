import { useParams } from 'react-router';
import { RevisionPage } from '../../features/review/components/revision-page.tsx';
import { NotFoundRoute } from './not-found.tsx';
import { useMe } from '../../lib/auth.ts';

/** Loaded lazily: one revision, read-only. */
export function Component() {
  const { id = '', n = '' } = useParams();
  const me = useMe();
  const number = Number(n);
  if (!me.data) return null;
  if (!Number.isInteger(number) || number < 1) return <NotFoundRoute />;
  return <RevisionPage key={`${id}/${number}`} studyId={id} n={number} role={me.data.role} />;
}
