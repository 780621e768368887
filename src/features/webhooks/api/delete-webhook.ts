import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { webhookKeys } from '@/lib/query-keys';

export function deleteWebhook(id: string): Promise<void> {
  return api.delete(`/partner/webhooks/${id}`);
}

export function useDeleteWebhook() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: deleteWebhook, onSuccess: () => queryClient.invalidateQueries({ queryKey: webhookKeys.all }) });
}
