import { queryOptions, useQuery } from '@tanstack/react-query';
import { referralDto, type ReferralDto } from '@shared/schemas/referrals';
import { api } from '@/lib/api-client';
import { caseKeys } from '@/lib/query-keys';

export function getReferral(id: string, signal?: AbortSignal): Promise<ReferralDto> {
  return api.get(`/referrals/${encodeURIComponent(id)}`, { schema: referralDto, signal });
}

export function getReferralQueryOptions(id: string) {
  return queryOptions({
    queryKey: caseKeys.detail(id),
    queryFn: ({ signal }) => getReferral(id, signal),
  });
}

/** While a lab has the offer in hand the case changes without the shop doing anything; check now and then. */
const WAITING_STATUSES = new Set<ReferralDto['status']>(['opened', 'offered', 'needs_attention']);

export function useReferral(id: string) {
  return useQuery({
    ...getReferralQueryOptions(id),
    refetchInterval: (query) => (query.state.data && WAITING_STATUSES.has(query.state.data.status) ? 30_000 : false),
  });
}
