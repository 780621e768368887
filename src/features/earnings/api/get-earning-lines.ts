import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { earningLineDto } from '@shared/schemas/money';
import { api } from '@/lib/api-client';
import { earningsKeys } from './keys';

const linesDto = z.object({ period: z.string(), lines: z.array(earningLineDto) });

/** The lines of one accrual month (UTC), for the month the person picked on the chart. */
export function getEarningLines(period: string, signal?: AbortSignal) {
  return api.get('/partner/earnings/lines', { params: { period }, schema: linesDto, signal });
}

export function getEarningLinesQueryOptions(period: string) {
  return queryOptions({ queryKey: earningsKeys.lines(period), queryFn: ({ signal }) => getEarningLines(period, signal) });
}

export function useEarningLines(period: string | null) {
  return useQuery({ ...getEarningLinesQueryOptions(period ?? ''), enabled: Boolean(period) });
}
