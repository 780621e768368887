import { queryOptions, useQuery } from '@tanstack/react-query';
import { notificationPreferencesDto, type NotificationPreferencesDto } from '@shared/schemas/notification-preferences';
import { api } from '@/lib/api-client';
import { notificationPreferenceKeys } from '@/lib/query-keys';

export function getNotificationPreferences(signal?: AbortSignal): Promise<NotificationPreferencesDto> {
  return api.get('/profile/notifications', { schema: notificationPreferencesDto, signal });
}

export function getNotificationPreferencesQueryOptions() {
  return queryOptions({ queryKey: notificationPreferenceKeys.all, queryFn: ({ signal }) => getNotificationPreferences(signal) });
}

export function useNotificationPreferences() {
  return useQuery(getNotificationPreferencesQueryOptions());
}
