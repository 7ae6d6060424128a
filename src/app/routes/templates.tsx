import { TemplatesPage } from '../../features/review/components/templates-page.tsx';
import { useMe } from '../../lib/auth.ts';

/** Loaded lazily: the template gallery. */
export function Component() {
  const me = useMe();
  if (!me.data) return null;
  return <TemplatesPage role={me.data.role} />;
}
