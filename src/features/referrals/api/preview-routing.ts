import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { routingPreviewDto, routingPreviewInput, type RoutingPreviewDto, type RoutingPreviewInput } from '@shared/schemas/referrals';
import { api } from '@/lib/api-client';
import { routingPreviewKeys } from '@/lib/query-keys';

export { routingPreviewInput };

export type RoutingPreview = RoutingPreviewDto;

/** What routing would decide for this device right now; nothing is stored. */
export function previewRouting(input: RoutingPreviewInput, signal?: AbortSignal): Promise<RoutingPreview> {
  return api.post('/referrals/preview', { body: input, schema: routingPreviewDto, signal });
}

export function getRoutingPreviewQueryOptions(input: RoutingPreviewInput | null) {
  return queryOptions({
    queryKey: routingPreviewKeys.preview(input),
    queryFn: ({ signal }) => previewRouting(input as RoutingPreviewInput, signal),
    enabled: input !== null,
    staleTime: 60_000,
    placeholderData: keepPreviousData,
  });
}

/** Pass null while the form does not yet say enough (no media type) to rank labs. */
export function useRoutingPreview(input: RoutingPreviewInput | null) {
  return useQuery(getRoutingPreviewQueryOptions(input));
}
