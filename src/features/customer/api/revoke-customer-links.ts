import { useMutation, useQueryClient } from '@tanstack/react-query';
import { customerLinkListDto, type CustomerLinkDto } from '@shared/schemas/lab-work';
import { api } from '@/lib/api-client';
import { caseKeys, labWorkKeys } from '@/lib/query-keys';

/** Switches off every live link of the case. */
export function revokeCustomerLinks(referralId: string): Promise<CustomerLinkDto[]> {
  return api.delete(`/referrals/${encodeURIComponent(referralId)}/customer-links`, { schema: customerLinkListDto }).then((l) => l.data);
}

export function useRevokeCustomerLinks(referralId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => revokeCustomerLinks(referralId),
    onSuccess: (links) => {
      queryClient.setQueryData(labWorkKeys.links(referralId), links);
      return queryClient.invalidateQueries({ queryKey: caseKeys.detail(referralId) });
    },
  });
}
