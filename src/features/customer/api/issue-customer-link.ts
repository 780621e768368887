import { useMutation, useQueryClient } from '@tanstack/react-query';
import { issuedCustomerLinkDto, type IssuedCustomerLinkDto } from '@shared/schemas/lab-work';
import { api } from '@/lib/api-client';
import { caseKeys, labWorkKeys } from '@/lib/query-keys';

/** A new private link for the customer; the answer is the only time its address is shown. */
export function issueCustomerLink({ referralId, sendEmail }: { referralId: string; sendEmail: boolean }): Promise<IssuedCustomerLinkDto> {
  return api.post(`/referrals/${encodeURIComponent(referralId)}/customer-links`, { body: { sendEmail }, schema: issuedCustomerLinkDto });
}

export function useIssueCustomerLink(referralId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (sendEmail: boolean) => issueCustomerLink({ referralId, sendEmail }),
    onSuccess: () => Promise.all([queryClient.invalidateQueries({ queryKey: labWorkKeys.links(referralId) }), queryClient.invalidateQueries({ queryKey: caseKeys.detail(referralId) })]),
  });
}
