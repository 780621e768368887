import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { webhookEndpointDto, type WebhookEndpointDto } from '@shared/schemas/webhooks';
import { api } from '@/lib/api-client';
import { webhookKeys } from '@/lib/query-keys';

export function getWebhooks(signal?: AbortSignal): Promise<WebhookEndpointDto[]> {
  return api.get('/partner/webhooks', { schema: z.array(webhookEndpointDto), signal });
}

export function getWebhooksQueryOptions() {
  return queryOptions({ queryKey: webhookKeys.lists(), queryFn: ({ signal }) => getWebhooks(signal) });
}

export function useWebhooks() {
  return useQuery(getWebhooksQueryOptions());
}
