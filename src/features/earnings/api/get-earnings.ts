import { queryOptions, useQuery } from '@tanstack/react-query';
import { earningsDto, type EarningsDto } from '@shared/schemas/money';
import { api } from '@/lib/api-client';
import { earningsKeys } from './keys';

export function getEarnings(signal?: AbortSignal): Promise<EarningsDto> {
  return api.get('/partner/earnings', { schema: earningsDto, signal });
}

export function getEarningsQueryOptions() {
  return queryOptions({ queryKey: earningsKeys.summary(), queryFn: ({ signal }) => getEarnings(signal) });
}

export function useEarnings() {
  return useQuery(getEarningsQueryOptions());
}
