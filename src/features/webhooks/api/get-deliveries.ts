import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { webhookDeliveryDto, type WebhookDeliveryDto } from '@shared/schemas/webhooks';
import { api } from '@/lib/api-client';
import { webhookKeys } from '@/lib/query-keys';

export function getDeliveries(endpointId: string, signal?: AbortSignal): Promise<WebhookDeliveryDto[]> {
  return api.get(`/partner/webhooks/${endpointId}/deliveries`, { schema: z.array(webhookDeliveryDto), signal });
}

export function getDeliveriesQueryOptions(endpointId: string) {
  return queryOptions({ queryKey: webhookKeys.deliveries(endpointId), queryFn: ({ signal }) => getDeliveries(endpointId, signal) });
}

export function useDeliveries(endpointId: string) {
  // Deliveries move on by themselves (retries), so the log refreshes while it is open.
  return useQuery({ ...getDeliveriesQueryOptions(endpointId), refetchInterval: 5000 });
}
