import { Navigate } from 'react-router';
import { AuditPage } from '../../features/audit/components/audit-page.tsx';
import { useMe } from '../../lib/auth.ts';

/** Loaded lazily; owners only (the server refuses others with 403 anyway). */
export function Component() {
  const me = useMe();
  if (!me.data) return null;
  if (me.data.role !== 'owner') return <Navigate to="/" replace />;
  return <AuditPage />;
}
