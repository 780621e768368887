import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { auditListDto, type AuditListDto } from '@shared/schemas/audit';
import { api } from '@/lib/api-client';
import { auditKeys, type AuditFilters } from '@/lib/query-keys';

export function getAuditEvents(filters: AuditFilters, signal?: AbortSignal): Promise<AuditListDto> {
  return api.get('/network/audit', { params: filters, schema: auditListDto, signal });
}

export function getAuditEventsQueryOptions(filters: AuditFilters) {
  return queryOptions({ queryKey: auditKeys.list(filters), queryFn: ({ signal }) => getAuditEvents(filters, signal) });
}

/** One page of the log; the previous page stays on screen while the next loads. */
export function useAuditEvents(filters: AuditFilters) {
  return useQuery({ ...getAuditEventsQueryOptions(filters), placeholderData: keepPreviousData });
}
