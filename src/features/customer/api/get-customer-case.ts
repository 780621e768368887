import { queryOptions, useQuery } from '@tanstack/react-query';
import { customerCaseDto, type CustomerCaseDto } from '@shared/schemas/customer';
import { api } from '@/lib/api-client';
import { customerCaseKeys } from '@/lib/query-keys';
import { asCustomer } from './customer-request';

export function getCustomerCase(token: string, signal?: AbortSignal): Promise<CustomerCaseDto> {
  return api.get('/customer/case', asCustomer(token, { schema: customerCaseDto, signal }));
}

export function getCustomerCaseQueryOptions(token: string) {
  return queryOptions({
    queryKey: customerCaseKeys.case(token),
    queryFn: ({ signal }) => getCustomerCase(token, signal),
    // A switched-off link stays switched off; asking again will not help.
    retry: false,
  });
}

/** While the lab works, the page looks again now and then, so the progress bar moves. */
const MOVING = new Set<CustomerCaseDto['status']>(['offered', 'accepted', 'label_issued', 'in_transit', 'received', 'evaluating', 'paid', 'recovering']);

export function useCustomerCase(token: string) {
  return useQuery({
    ...getCustomerCaseQueryOptions(token),
    refetchInterval: (query) => (query.state.data && MOVING.has(query.state.data.status) ? 30_000 : false),
  });
}
