import { useParams, useSearchParams } from 'react-router';
import { PrintPage } from '../../features/review/components/print-page.tsx';
import { NotFoundRoute } from './not-found.tsx';
import { useMe } from '../../lib/auth.ts';

/** Loaded lazily: the printable report of one revision (`?units=pu`, `?case=<id>`). */
export function Component() {
  const { id = '', n = '' } = useParams();
  const [search] = useSearchParams();
  const me = useMe();
  const number = Number(n);
  if (!me.data) return null;
  if (!Number.isInteger(number) || number < 1) return <NotFoundRoute />;
  const units = search.get('units') === 'pu' ? 'pu' : 'si';
  const caseId = search.get('case') ?? undefined;
  return <PrintPage key={`${id}/${number}/${units}/${caseId ?? ''}`} studyId={id} n={number} units={units} caseId={caseId} />;
}
