import { queryOptions, useQuery } from '@tanstack/react-query';
import { outboundListDto } from '@shared/schemas/shipping';
import { api } from '@/lib/api-client';
import { inboundKeys } from '@/lib/query-keys';

export function getOutbound(signal?: AbortSignal) {
  return api.get('/lab/outbound', { schema: outboundListDto, signal });
}

export function getOutboundQueryOptions() {
  return queryOptions({ queryKey: inboundKeys.outbound(), queryFn: ({ signal }) => getOutbound(signal) });
}

export function useOutbound() {
  return useQuery({ ...getOutboundQueryOptions(), refetchInterval: 30_000 });
}
