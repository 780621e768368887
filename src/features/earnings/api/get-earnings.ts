import { queryOptions, useQuery } from '@tanstack/react-query';
import { earningsDto, type EarningsDto } from '@shared/schemas/money';
import { api } from '@/lib/api-client';
import type { Payee } from '../payee';
import { earningsKeys } from './keys';

export function getEarnings(payee: Payee, signal?: AbortSignal): Promise<EarningsDto> {
  return api.get(`/${payee}/earnings`, { schema: earningsDto, signal });
}

export function getEarningsQueryOptions(payee: Payee) {
  return queryOptions({ queryKey: earningsKeys.summary(payee), queryFn: ({ signal }) => getEarnings(payee, signal) });
}

export function useEarnings(payee: Payee) {
  return useQuery(getEarningsQueryOptions(payee));
}
