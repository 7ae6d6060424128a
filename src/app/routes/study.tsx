import { useParams } from 'react-router';
import { StudyPage } from '../../features/studies/components/study-page.tsx';
import { useMe } from '../../lib/auth.ts';

/** Loaded lazily: the list stays light. */
export function Component() {
  const { id = '' } = useParams();
  const me = useMe();
  if (!me.data) return null;
  return <StudyPage key={id} id={id} role={me.data.role} />;
}
