import { useMutation, useQueryClient } from '@tanstack/react-query';
import { referralDto, type ReferralDto } from '@shared/schemas/referrals';
import { api } from '@/lib/api-client';
import { caseKeys } from '@/lib/query-keys';

/** Statuses in which nothing has shipped yet, so the shop may still cancel. */
export const cancellableStatuses: readonly ReferralDto['status'][] = ['opened', 'needs_attention', 'offered', 'accepted'];

export function cancelReferral(id: string): Promise<ReferralDto> {
  return api.delete(`/referrals/${encodeURIComponent(id)}`, { schema: referralDto });
}

export function useCancelReferral() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: cancelReferral,
    onSuccess: (referral) => {
      queryClient.setQueryData(caseKeys.detail(referral.id), referral);
      return queryClient.invalidateQueries({ queryKey: caseKeys.all });
    },
  });
}
