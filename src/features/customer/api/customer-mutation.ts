import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CustomerCaseDto } from '@shared/schemas/customer';
import { customerCaseKeys } from '@/lib/query-keys';

/** The customer's actions answer with the whole page's new state, which replaces the cached one. */
export function useCustomerMutation<V>(token: string, mutationFn: (variables: V) => Promise<CustomerCaseDto>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn,
    onSuccess: (page) => {
      queryClient.setQueryData(customerCaseKeys.case(token), page);
    },
  });
}
