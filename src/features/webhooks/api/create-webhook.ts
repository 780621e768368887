import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { createdWebhookEndpointDto, createWebhookEndpointInput, type CreateWebhookEndpointInput } from '@shared/schemas/webhooks';
import { api } from '@/lib/api-client';
import { webhookKeys } from '@/lib/query-keys';

export { createWebhookEndpointInput };
export type CreatedWebhookEndpoint = z.infer<typeof createdWebhookEndpointDto>;

/** The answer carries the signing secret, the only time it is sent; it is never cached. */
export function createWebhook(input: CreateWebhookEndpointInput): Promise<CreatedWebhookEndpoint> {
  return api.post('/partner/webhooks', { body: input, schema: createdWebhookEndpointDto });
}

export function useCreateWebhook() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createWebhook, onSuccess: () => queryClient.invalidateQueries({ queryKey: webhookKeys.lists() }) });
}
