import { queryOptions, useQuery } from '@tanstack/react-query';
import { settlementPeriodDto } from '@shared/schemas/money';
import { api } from '@/lib/api-client';
import { settlementKeys } from './keys';

/** Every statement of one period, with the runs that made and paid them. */
export function getSettlementPeriod(period: string, signal?: AbortSignal) {
  return api.get(`/network/settlements/${encodeURIComponent(period)}`, { schema: settlementPeriodDto, signal });
}

export function getSettlementPeriodQueryOptions(period: string) {
  return queryOptions({ queryKey: settlementKeys.period(period), queryFn: ({ signal }) => getSettlementPeriod(period, signal) });
}

export function useSettlementPeriod(period: string | null) {
  return useQuery({ ...getSettlementPeriodQueryOptions(period ?? ''), enabled: Boolean(period) });
}
