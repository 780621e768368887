import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { labOfferListDto, type LabOfferDto } from '@shared/schemas/labs';
import { api } from '@/lib/api-client';
import { offerKeys } from '@/lib/query-keys';

export type OfferStatusFilter = LabOfferDto['status'] | undefined;

/** The offers made to the signed-in manager's lab, newest first. */
export function getOffers(status: OfferStatusFilter, signal?: AbortSignal): Promise<LabOfferDto[]> {
  return api.get('/lab/offers', { params: { status }, schema: labOfferListDto, signal }).then((list) => list.data);
}

export function getOffersQueryOptions(status: OfferStatusFilter) {
  return queryOptions({
    queryKey: offerKeys.list({ status }),
    queryFn: ({ signal }) => getOffers(status, signal),
    placeholderData: keepPreviousData,
    // New offers arrive without the manager doing anything.
    refetchInterval: 60_000,
  });
}

export function useOffers(status: OfferStatusFilter) {
  return useQuery(getOffersQueryOptions(status));
}
