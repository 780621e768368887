import { queryOptions, useQuery } from '@tanstack/react-query';
import { shopLabWorkDto, type ShopLabWorkDto } from '@shared/schemas/lab-work';
import { api } from '@/lib/api-client';
import { labWorkKeys } from '@/lib/query-keys';

/** The shop's view of the lab's work on its case: evaluation, quote, imaging, file counts, payment. */
export function getShopLabWork(referralId: string, signal?: AbortSignal): Promise<ShopLabWorkDto> {
  return api.get(`/referrals/${encodeURIComponent(referralId)}/lab-work`, { schema: shopLabWorkDto, signal });
}

export function useShopLabWork(referralId: string) {
  return useQuery({
    ...queryOptions({ queryKey: labWorkKeys.shop(referralId), queryFn: ({ signal }) => getShopLabWork(referralId, signal) }),
    refetchInterval: (query) => (query.state.data && ['paid', 'recovering'].includes(query.state.data.status) ? 30_000 : false),
  });
}
