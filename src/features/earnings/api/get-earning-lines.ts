import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { earningLineDto } from '@shared/schemas/money';
import { api } from '@/lib/api-client';
import type { Payee } from '../payee';
import { earningsKeys } from './keys';

const linesDto = z.object({ period: z.string(), lines: z.array(earningLineDto) });

/** The lines of one accrual month (UTC), for the month the person picked on the chart. */
export function getEarningLines(payee: Payee, period: string, signal?: AbortSignal) {
  return api.get(`/${payee}/earnings/lines`, { params: { period }, schema: linesDto, signal });
}

export function getEarningLinesQueryOptions(payee: Payee, period: string) {
  return queryOptions({ queryKey: earningsKeys.lines(payee, period), queryFn: ({ signal }) => getEarningLines(payee, period, signal) });
}

export function useEarningLines(payee: Payee, period: string | null) {
  return useQuery({ ...getEarningLinesQueryOptions(payee, period ?? ''), enabled: Boolean(period) });
}
