import { useMutation, useQueryClient } from '@tanstack/react-query';
import { labOfferDto, type LabOfferDto } from '@shared/schemas/labs';
import { api } from '@/lib/api-client';
import { caseKeys, offerKeys } from '@/lib/query-keys';

export function acceptOffer(id: string): Promise<LabOfferDto> {
  return api.post(`/lab/offers/${encodeURIComponent(id)}/accept`, { schema: labOfferDto });
}

export function useAcceptOffer() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: acceptOffer,
    onSuccess: (offer) => {
      queryClient.setQueryData(offerKeys.detail(offer.id), offer);
      return Promise.all([queryClient.invalidateQueries({ queryKey: offerKeys.all }), queryClient.invalidateQueries({ queryKey: caseKeys.all })]);
    },
  });
}
