import { queryOptions } from '@tanstack/react-query';
import { payoutAccountDto, type PayoutAccountDto } from '@shared/schemas/money';
import { api } from '@/lib/api-client';
import { earningsKeys } from './keys';

/** The payout account as the provider sees it now (the server asks the provider while set-up is unfinished). */
export function getPayoutAccount(signal?: AbortSignal): Promise<PayoutAccountDto> {
  return api.get('/partner/payout-account', { schema: payoutAccountDto, signal });
}

export function getPayoutAccountQueryOptions() {
  return queryOptions({ queryKey: [...earningsKeys.all, 'payout-account'] as const, queryFn: ({ signal }) => getPayoutAccount(signal) });
}
