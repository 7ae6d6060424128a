import { TeamPage } from '../../features/team/components/team-page.tsx';
import { useMe } from '../../lib/auth.ts';

/** Loaded lazily. */
export function Component() {
  const me = useMe();
  if (!me.data) return null;
  return <TeamPage me={me.data} />;
}
