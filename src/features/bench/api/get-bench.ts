import { queryOptions, useQuery } from '@tanstack/react-query';
import { benchListDto, type BenchRowDto, type benchStatuses } from '@shared/schemas/lab-work';
import { api } from '@/lib/api-client';
import { benchKeys } from '@/lib/query-keys';

export type BenchStatusFilter = (typeof benchStatuses)[number] | undefined;

export function getBench(status: BenchStatusFilter, signal?: AbortSignal): Promise<BenchRowDto[]> {
  return api.get('/lab/bench', { params: { status }, schema: benchListDto, signal }).then((list) => list.data);
}

export function getBenchQueryOptions(status?: BenchStatusFilter) {
  return queryOptions({
    queryKey: benchKeys.list({ status }),
    queryFn: ({ signal }) => getBench(status, signal),
  });
}

/** The queue changes as boxes arrive and customers answer; it is checked again now and then. */
export function useBench(status?: BenchStatusFilter) {
  return useQuery({ ...getBenchQueryOptions(status), refetchInterval: 60_000 });
}
