import { StudiesList } from '../../features/studies/components/studies-list.tsx';
import { useMe } from '../../lib/auth.ts';

export function StudiesRoute() {
  const me = useMe();
  if (!me.data) return null;
  return <StudiesList role={me.data.role} />;
}
