import type { QueryClient } from '@tanstack/react-query';
import { Link, Navigate, NavLink, Outlet, redirect, useLocation, useNavigate, type LoaderFunctionArgs } from 'react-router';
import { RoleBadge } from '../../components/badges.tsx';
import { Button } from '../../components/button.tsx';
import { SafetyNote } from '../../components/safety-note.tsx';
import { NotificationBell } from '../../features/notifications/components/notification-bell.tsx';
import { isApiError } from '../../lib/api-client.ts';
import { meQueryOptions, useMe, useSignOut } from '../../lib/auth.ts';
import { can } from '../../lib/authorization.ts';

/** Guard for every signed-in page: make sure `/api/auth/me` answers, or go to sign-in and come back. */
export function appLayoutLoader(queryClient: QueryClient) {
  return async ({ request }: LoaderFunctionArgs) => {
    try {
      await queryClient.ensureQueryData(meQueryOptions());
    } catch (error) {
      if (isApiError(error, 401)) {
        const url = new URL(request.url);
        const next = url.pathname + url.search;
        throw redirect(next === '/' ? '/sign-in' : `/sign-in?next=${encodeURIComponent(next)}`);
      }
      throw error;
    }
    return null;
  };
}

const navClass = (isActive: boolean) =>
  `rounded-[3px] px-2 py-1 text-[13px] font-semibold ${isActive ? 'bg-console-ink/15 text-white underline decoration-2 underline-offset-[6px]' : 'text-console-muted hover:text-white'}`;
const NAV_LINK = ({ isActive }: { isActive: boolean }) => navClass(isActive);

/** Shown while the first signed-in page checks the session. */
export function AppLayoutFallback() {
  return (
    <div className="min-h-screen bg-paper">
      <div className="h-10 bg-console" />
      <p role="status" className="px-6 py-5 text-sm text-ink-muted">
        Loading Wyeward…
      </p>
    </div>
  );
}

/** Header (product, nav, team, user, role, sign-out), the page, and the safety caution. */
export function AppLayout() {
  const me = useMe();
  const signOut = useSignOut();
  const navigate = useNavigate();
  const location = useLocation();

  if (me.isError && isApiError(me.error, 401)) {
    return <Navigate to={`/sign-in?next=${encodeURIComponent(location.pathname + location.search)}`} replace />;
  }
  if (!me.data) return null; // the loader has ensured it; this only covers a refetch after the cache was cleared
  const { user, team, role } = me.data;

  return (
    <div className="flex min-h-screen flex-col bg-paper">
      <header className="bg-console text-console-ink print:hidden">
        <div className="flex flex-wrap items-center gap-x-6 gap-y-2 px-6 py-2">
          <Link to="/" className="text-base font-semibold tracking-wide text-white">
            Wyeward
          </Link>
          <nav aria-label="Main" className="flex items-center gap-1">
            {/* The list and every study page belong to "Studies". */}
            <NavLink to="/" className={() => navClass(location.pathname === '/' || location.pathname.startsWith('/studies/'))}>
              Studies
            </NavLink>
            <NavLink to="/templates" className={NAV_LINK}>
              Templates
            </NavLink>
            <NavLink to="/team" end className={NAV_LINK}>
              Team
            </NavLink>
            {can(role, 'mail:read') ? (
              <NavLink to="/team/mail" className={NAV_LINK}>
                Outgoing mail
              </NavLink>
            ) : null}
            {role === 'owner' ? (
              <NavLink to="/audit" className={NAV_LINK}>
                Audit
              </NavLink>
            ) : null}
          </nav>
          <div className="ml-auto flex items-center gap-3 text-[13px]">
            <NotificationBell />
            <span className="text-console-muted">
              Team <span className="font-semibold text-console-ink">{team.name}</span>
            </span>
            <span aria-hidden="true" className="h-4 w-px bg-console-muted/40" />
            <span className="flex items-center gap-2">
              <span className="font-semibold">{user.name}</span>
              <span className="sr-only">, role</span>
              <RoleBadge role={role} tone="dark" />
            </span>
            <Button
              size="sm"
              variant="ghost"
              className="text-console-ink hover:bg-console-ink/15"
              busy={signOut.isPending}
              busyText="Signing out…"
              onClick={() => signOut.mutate(undefined, { onSettled: () => navigate('/sign-in', { replace: true }) })}
            >
              Sign out
            </Button>
          </div>
        </div>
      </header>
      <main className="flex-1 px-6 py-5 print:p-0">
        <Outlet />
      </main>
      <SafetyNote />
    </div>
  );
}
