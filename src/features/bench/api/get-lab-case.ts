import { queryOptions, useQuery } from '@tanstack/react-query';
import { labCaseDto, type LabCaseDto } from '@shared/schemas/lab-work';
import { api } from '@/lib/api-client';
import { benchKeys } from '@/lib/query-keys';

export function getLabCase(id: string, signal?: AbortSignal): Promise<LabCaseDto> {
  return api.get(`/lab/cases/${encodeURIComponent(id)}`, { schema: labCaseDto, signal });
}

export function getLabCaseQueryOptions(id: string) {
  return queryOptions({
    queryKey: benchKeys.case(id),
    queryFn: ({ signal }) => getLabCase(id, signal),
  });
}

/** Customers answer and tools report without the page doing anything: while that can happen, look again. */
const CHANGING = new Set<LabCaseDto['status']>(['quote_sent', 'approved', 'paid', 'recovering', 'ready_for_review']);

export function useLabCase(id: string) {
  return useQuery({
    ...getLabCaseQueryOptions(id),
    refetchInterval: (query) => (query.state.data && CHANGING.has(query.state.data.status) ? 20_000 : false),
  });
}
