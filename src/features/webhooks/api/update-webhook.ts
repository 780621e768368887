import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { updateWebhookEndpointInput, webhookEndpointDto, type WebhookEndpointDto } from '@shared/schemas/webhooks';
import { api } from '@/lib/api-client';
import { webhookKeys } from '@/lib/query-keys';

export function updateWebhook({ id, ...input }: { id: string } & z.input<typeof updateWebhookEndpointInput>): Promise<WebhookEndpointDto> {
  return api.patch(`/partner/webhooks/${id}`, { body: input, schema: webhookEndpointDto });
}

export function useUpdateWebhook() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: updateWebhook, onSuccess: () => queryClient.invalidateQueries({ queryKey: webhookKeys.lists() }) });
}
