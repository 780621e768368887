import { queryOptions, useQuery } from '@tanstack/react-query';
import { settlementOverviewDto, type SettlementOverviewDto } from '@shared/schemas/money';
import { api } from '@/lib/api-client';
import { settlementKeys } from './keys';

export function getSettlementOverview(signal?: AbortSignal): Promise<SettlementOverviewDto> {
  return api.get('/network/settlements', { schema: settlementOverviewDto, signal });
}

export function getSettlementOverviewQueryOptions() {
  return queryOptions({ queryKey: settlementKeys.overview(), queryFn: ({ signal }) => getSettlementOverview(signal) });
}

export function useSettlementOverview() {
  return useQuery(getSettlementOverviewQueryOptions());
}
