import { NotificationsPage } from '../../features/notifications/components/notifications-page.tsx';

/** Loaded lazily: the signed-in member's notifications. */
export function Component() {
  return <NotificationsPage />;
}
