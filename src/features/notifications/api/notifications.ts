import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { MarkReadRequest, NotificationListResponse } from '../../../../shared/api/notifications.ts';
import { api } from '../../../lib/api-client.ts';

export const notificationKeys = {
  all: ['notifications'] as const,
  list: () => [...notificationKeys.all, 'list'] as const,
};

/** GET /api/notifications: the newest 100 of the signed-in member's notifications and the unread count. */
export function getNotifications(signal?: AbortSignal): Promise<NotificationListResponse> {
  return api.get<NotificationListResponse>('/api/notifications', { signal });
}

export function notificationsQueryOptions() {
  // The bell re-asks every minute so a review request shows up without a reload.
  return queryOptions({ queryKey: notificationKeys.list(), queryFn: ({ signal }) => getNotifications(signal), refetchInterval: 60_000 });
}

export function useNotifications() {
  return useQuery(notificationsQueryOptions());
}

/** POST /api/notifications/read: the given ids, or all when none are given. */
export function markRead(body: MarkReadRequest): Promise<{ unread: number }> {
  return api.post<{ unread: number }>('/api/notifications/read', body);
}

export function useMarkRead() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: markRead, onSuccess: () => queryClient.invalidateQueries({ queryKey: notificationKeys.all }) });
}
