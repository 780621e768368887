import { queryOptions, useQuery } from '@tanstack/react-query';
import { caseShippingDto, type CaseShippingDto } from '@shared/schemas/shipping';
import { api } from '@/lib/api-client';
import { shipmentKeys } from '@/lib/query-keys';

export function getCaseShipping(referralId: string, signal?: AbortSignal): Promise<CaseShippingDto> {
  return api.get(`/referrals/${encodeURIComponent(referralId)}/shipping`, { schema: caseShippingDto, signal });
}

export function getCaseShippingQueryOptions(referralId: string) {
  return queryOptions({ queryKey: shipmentKeys.caseShipping(referralId), queryFn: ({ signal }) => getCaseShipping(referralId, signal) });
}

/** While a box is on its way the carrier moves it without the shop doing anything; look again now and then. */
export function useCaseShipping(referralId: string) {
  return useQuery({
    ...getCaseShippingQueryOptions(referralId),
    refetchInterval: (query) =>
      query.state.data?.shipments.some((s) => ['label_issued', 'in_transit', 'out_for_delivery', 'exception'].includes(s.status)) ? 20_000 : false,
  });
}
