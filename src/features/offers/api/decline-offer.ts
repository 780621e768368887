import { useMutation, useQueryClient } from '@tanstack/react-query';
import { labOfferDto, type LabOfferDto } from '@shared/schemas/labs';
import { declineOfferInput, type DeclineOfferInput } from '@shared/schemas/referrals';
import { api } from '@/lib/api-client';
import { caseKeys, offerKeys } from '@/lib/query-keys';

export { declineOfferInput };

export function declineOffer({ id, input }: { id: string; input: DeclineOfferInput }): Promise<LabOfferDto> {
  return api.post(`/lab/offers/${encodeURIComponent(id)}/decline`, { body: input, schema: labOfferDto });
}

export function useDeclineOffer() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: declineOffer,
    onSuccess: (offer) => {
      queryClient.setQueryData(offerKeys.detail(offer.id), offer);
      return Promise.all([queryClient.invalidateQueries({ queryKey: offerKeys.all }), queryClient.invalidateQueries({ queryKey: caseKeys.all })]);
    },
  });
}
