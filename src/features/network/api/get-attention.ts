import { queryOptions, useQuery } from '@tanstack/react-query';
import { attentionListDto, type AttentionItemDto } from '@shared/schemas/labs';
import { api } from '@/lib/api-client';
import { networkKeys } from '@/lib/query-keys';

/** Cases no lab has taken, oldest first, each with the ranking as it stands now. */
export function getAttention(signal?: AbortSignal): Promise<AttentionItemDto[]> {
  return api.get('/network/attention', { schema: attentionListDto, signal }).then((list) => list.data);
}

export function getAttentionQueryOptions() {
  return queryOptions({ queryKey: networkKeys.attention(), queryFn: ({ signal }) => getAttention(signal), refetchInterval: 60_000 });
}

export function useAttention() {
  return useQuery(getAttentionQueryOptions());
}
