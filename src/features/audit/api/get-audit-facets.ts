import { queryOptions, useQuery } from '@tanstack/react-query';
import { auditFacetsDto, type AuditFacetsDto } from '@shared/schemas/audit';
import { api } from '@/lib/api-client';
import { auditKeys } from '@/lib/query-keys';

export function getAuditFacets(signal?: AbortSignal): Promise<AuditFacetsDto> {
  return api.get('/network/audit/facets', { schema: auditFacetsDto, signal });
}

export function getAuditFacetsQueryOptions() {
  return queryOptions({ queryKey: auditKeys.facets(), queryFn: ({ signal }) => getAuditFacets(signal), staleTime: 60_000 });
}

export function useAuditFacets() {
  return useQuery(getAuditFacetsQueryOptions());
}
