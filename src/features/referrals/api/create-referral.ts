import { useMutation, useQueryClient } from '@tanstack/react-query';
import { counterReferralInput, referralDto, type ReferralDto } from '@shared/schemas/referrals';
import { api } from '@/lib/api-client';
import { caseKeys } from '@/lib/query-keys';

export { counterReferralInput };

/** The counter form's body: the parsed intake, with the customer's consent. */
export type CreateReferralInput = ReturnType<typeof counterReferralInput.parse>;

export function createReferral(input: CreateReferralInput): Promise<ReferralDto> {
  return api.post('/referrals', { body: input, schema: referralDto });
}

export function useCreateReferral() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createReferral,
    onSuccess: (referral) => {
      queryClient.setQueryData(caseKeys.detail(referral.id), referral);
      return queryClient.invalidateQueries({ queryKey: caseKeys.lists() });
    },
  });
}
