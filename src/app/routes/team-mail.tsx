import { Navigate } from 'react-router';
import { MailPage } from '../../features/team/components/mail-page.tsx';
import { useMe } from '../../lib/auth.ts';
import { can } from '../../lib/authorization.ts';

/** Loaded lazily; owners only (the server refuses others with 403 anyway). */
export function Component() {
  const me = useMe();
  if (!me.data) return null;
  if (!can(me.data.role, 'mail:read')) return <Navigate to="/team" replace />;
  return <MailPage />;
}
