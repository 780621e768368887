import { queryOptions, useQuery } from '@tanstack/react-query';
import { labOfferDto, type LabOfferDto } from '@shared/schemas/labs';
import { api } from '@/lib/api-client';
import { offerKeys } from '@/lib/query-keys';

export function getOffer(id: string, signal?: AbortSignal): Promise<LabOfferDto> {
  return api.get(`/lab/offers/${encodeURIComponent(id)}`, { schema: labOfferDto, signal });
}

export function getOfferQueryOptions(id: string) {
  return queryOptions({
    queryKey: offerKeys.detail(id),
    queryFn: ({ signal }) => getOffer(id, signal),
  });
}

export function useOffer(id: string) {
  return useQuery(getOfferQueryOptions(id));
}
