import { queryOptions, useQuery } from '@tanstack/react-query';
import { custodyLogDto, type CustodyLogDto } from '@shared/schemas/custody';
import { api } from '@/lib/api-client';
import { caseRecordKeys } from '@/lib/query-keys';

export function getCustody(caseId: string, signal?: AbortSignal): Promise<CustodyLogDto> {
  return api.get(`/referrals/${encodeURIComponent(caseId)}/custody`, { schema: custodyLogDto, signal });
}

export function getCustodyQueryOptions(caseId: string) {
  return queryOptions({ queryKey: caseRecordKeys.custody(caseId), queryFn: ({ signal }) => getCustody(caseId, signal) });
}

export function useCustody(caseId: string) {
  return useQuery(getCustodyQueryOptions(caseId));
}
