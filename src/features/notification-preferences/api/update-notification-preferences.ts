import { useMutation, useQueryClient } from '@tanstack/react-query';
import {
  notificationPreferencesDto,
  updateNotificationPreferencesInput,
  type NotificationPreferencesDto,
  type UpdateNotificationPreferencesInput,
} from '@shared/schemas/notification-preferences';
import { api } from '@/lib/api-client';
import { notificationPreferenceKeys } from '@/lib/query-keys';

export { updateNotificationPreferencesInput };

export function updateNotificationPreferences(input: UpdateNotificationPreferencesInput): Promise<NotificationPreferencesDto> {
  return api.put('/profile/notifications', { body: input, schema: notificationPreferencesDto });
}

export function useUpdateNotificationPreferences() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateNotificationPreferences,
    onSuccess: (saved) => queryClient.setQueryData(notificationPreferenceKeys.all, saved),
  });
}
