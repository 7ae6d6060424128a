import { NavLink } from 'react-router';
import { useNotifications } from '../api/notifications.ts';

/** The header's bell: a link to the notification list whose name says how many are unread. */
export function NotificationBell() {
  const list = useNotifications();
  const unread = list.data?.unread ?? 0;
  const label = unread === 0 ? 'Notifications, none unread' : `Notifications, ${unread} unread`;
  return (
    <NavLink
      to="/notifications"
      aria-label={label}
      title={label}
      className={({ isActive }) =>
        `relative inline-flex h-7 items-center gap-1 rounded-[3px] px-2 text-[13px] font-semibold ${isActive ? 'bg-console-ink/15 text-white' : 'text-console-ink hover:bg-console-ink/15'}`
      }
    >
      <svg aria-hidden="true" viewBox="0 0 16 16" className="h-4 w-4" fill="none" stroke="currentColor" strokeWidth="1.5">
        <path d="M4 11V7a4 4 0 0 1 8 0v4l1.2 1.5H2.8L4 11Z" strokeLinejoin="round" />
        <path d="M6.5 14a1.6 1.6 0 0 0 3 0" />
      </svg>
      {unread > 0 ? (
        <span aria-hidden="true" className="num rounded-full bg-focus px-1.5 text-[11px] leading-4 text-console">
          {unread > 99 ? '99+' : unread}
        </span>
      ) : null}
    </NavLink>
  );
}
