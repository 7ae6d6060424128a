import { useParams } from 'react-router';
import { HistoryPage } from '../../features/review/components/history-page.tsx';
import { useMe } from '../../lib/auth.ts';

/** Loaded lazily: a study's revisions. */
export function Component() {
  const { id = '' } = useParams();
  const me = useMe();
  if (!me.data) return null;
  return <HistoryPage key={id} studyId={id} role={me.data.role} />;
}
