import { queryOptions, useQuery } from '@tanstack/react-query';
import { caseDispositionDto, type CaseDispositionDto } from '@shared/schemas/disposition';
import { api } from '@/lib/api-client';
import { caseRecordKeys } from '@/lib/query-keys';

export function getDispositions(caseId: string, signal?: AbortSignal): Promise<CaseDispositionDto> {
  return api.get(`/referrals/${encodeURIComponent(caseId)}/dispositions`, { schema: caseDispositionDto, signal });
}

export function getDispositionsQueryOptions(caseId: string) {
  return queryOptions({ queryKey: caseRecordKeys.dispositions(caseId), queryFn: ({ signal }) => getDispositions(caseId, signal) });
}

export function useDispositions(caseId: string) {
  return useQuery(getDispositionsQueryOptions(caseId));
}
