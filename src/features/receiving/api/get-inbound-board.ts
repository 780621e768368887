import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { inboundBoardDto, type InboundBoardDto } from '@shared/schemas/shipping';
import { api } from '@/lib/api-client';
import { inboundKeys, type InboundBoardFilters } from '@/lib/query-keys';

export function getInboundBoard(filters: InboundBoardFilters, signal?: AbortSignal): Promise<InboundBoardDto> {
  return api.get('/lab/inbound', { params: { bucket: filters.bucket, q: filters.q || undefined }, schema: inboundBoardDto, signal });
}

export function getInboundBoardQueryOptions(filters: InboundBoardFilters = {}) {
  return queryOptions({ queryKey: inboundKeys.board(filters), queryFn: ({ signal }) => getInboundBoard(filters, signal) });
}

/** The board follows the carriers by itself: it looks again every 30 seconds. */
export function useInboundBoard(filters: InboundBoardFilters) {
  return useQuery({ ...getInboundBoardQueryOptions(filters), refetchInterval: 30_000, placeholderData: keepPreviousData });
}
