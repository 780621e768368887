import { useMutation, useQueryClient } from '@tanstack/react-query';
import { declineAfterArrivalInput, type DeclineAfterArrivalInput } from '@shared/schemas/shipping';
import { api } from '@/lib/api-client';
import { inboundKeys, offerKeys } from '@/lib/query-keys';

export { declineAfterArrivalInput };

export function declineAfterArrival({ referralId, input }: { referralId: string; input: DeclineAfterArrivalInput }) {
  return api.post(`/lab/cases/${encodeURIComponent(referralId)}/decline-after-arrival`, { body: input });
}

export function useDeclineAfterArrival() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: declineAfterArrival,
    onSuccess: () => Promise.all([queryClient.invalidateQueries({ queryKey: inboundKeys.all }), queryClient.invalidateQueries({ queryKey: offerKeys.all })]),
  });
}
