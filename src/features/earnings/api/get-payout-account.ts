import { queryOptions } from '@tanstack/react-query';
import { payoutAccountDto, type PayoutAccountDto } from '@shared/schemas/money';
import { api } from '@/lib/api-client';
import type { Payee } from '../payee';
import { earningsKeys } from './keys';

/** The payout account as the provider sees it now (the server asks the provider while set-up is unfinished). */
export function getPayoutAccount(payee: Payee, signal?: AbortSignal): Promise<PayoutAccountDto> {
  return api.get(`/${payee}/payout-account`, { schema: payoutAccountDto, signal });
}

export function getPayoutAccountQueryOptions(payee: Payee) {
  return queryOptions({ queryKey: earningsKeys.payoutAccount(payee), queryFn: ({ signal }) => getPayoutAccount(payee, signal) });
}
