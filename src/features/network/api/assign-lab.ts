import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { assignLabInput, referralDto, type ReferralDto } from '@shared/schemas/referrals';
import { api } from '@/lib/api-client';
import { caseKeys, networkKeys } from '@/lib/query-keys';

export { assignLabInput };
export type AssignLabInput = z.infer<typeof assignLabInput>;

/** Offers the case to the lab the network admin chose. */
export function assignLab({ referralId, input }: { referralId: string; input: AssignLabInput }): Promise<ReferralDto> {
  return api.post(`/network/referrals/${encodeURIComponent(referralId)}/assign`, { body: input, schema: referralDto });
}

export function useAssignLab() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: assignLab,
    onSuccess: () => Promise.all([queryClient.invalidateQueries({ queryKey: networkKeys.all }), queryClient.invalidateQueries({ queryKey: caseKeys.all })]),
  });
}
