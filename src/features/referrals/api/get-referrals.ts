import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { referralListDto } from '@shared/schemas/referrals';
import type { CaseStatus } from '@shared/vocabulary';
import { api } from '@/lib/api-client';
import { caseKeys } from '@/lib/query-keys';

export type ReferralList = ReturnType<typeof referralListDto.parse>;

/** What the case table asks for (a subset of the shared referralListQuery). */
export interface ReferralListQuery {
  status?: CaseStatus;
  q?: string;
  limit?: number;
  cursor?: string;
}

/** One page of the shop's cases, newest first; `cursor` is the previous page's `nextCursor`. */
export function getReferrals(query: ReferralListQuery, signal?: AbortSignal): Promise<ReferralList> {
  return api.get('/referrals', { params: { ...query }, schema: referralListDto, signal });
}

export function getReferralsQueryOptions(query: ReferralListQuery) {
  return queryOptions({
    queryKey: caseKeys.list({ ...query }),
    queryFn: ({ signal }) => getReferrals(query, signal),
    // Keep the current page on screen while the next one (or a new filter) loads.
    placeholderData: keepPreviousData,
  });
}

export function useReferrals(query: ReferralListQuery) {
  return useQuery(getReferralsQueryOptions(query));
}
