import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { webhookKeys } from '@/lib/query-keys';

export function resendDelivery({ endpointId, deliveryId }: { endpointId: string; deliveryId: string }): Promise<unknown> {
  return api.post(`/partner/webhooks/${endpointId}/deliveries/${deliveryId}/resend`, { schema: z.object({ status: z.string() }) });
}

export function useResendDelivery() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: resendDelivery,
    onSuccess: (_data, { endpointId }) => queryClient.invalidateQueries({ queryKey: webhookKeys.deliveries(endpointId) }),
  });
}
