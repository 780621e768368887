import { queryOptions, useQuery } from '@tanstack/react-query';
import { customerLinkListDto, type CustomerLinkDto } from '@shared/schemas/lab-work';
import { api } from '@/lib/api-client';
import { labWorkKeys } from '@/lib/query-keys';

export function getCustomerLinks(referralId: string, signal?: AbortSignal): Promise<CustomerLinkDto[]> {
  return api.get(`/referrals/${encodeURIComponent(referralId)}/customer-links`, { schema: customerLinkListDto, signal }).then((l) => l.data);
}

export function useCustomerLinks(referralId: string) {
  return useQuery(queryOptions({ queryKey: labWorkKeys.links(referralId), queryFn: ({ signal }) => getCustomerLinks(referralId, signal) }));
}
