import { useMutation, useQueryClient } from '@tanstack/react-query';
import { releaseHoldInput, type ReleaseHoldInput } from '@shared/schemas/shipping';
import { api } from '@/lib/api-client';
import { inboundKeys } from '@/lib/query-keys';

export { releaseHoldInput };

export function releaseHold({ referralId, input }: { referralId: string; input: ReleaseHoldInput }) {
  return api.post(`/lab/cases/${encodeURIComponent(referralId)}/release-hold`, { body: input });
}

export function useReleaseHold() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: releaseHold, onSuccess: () => queryClient.invalidateQueries({ queryKey: inboundKeys.all }) });
}
