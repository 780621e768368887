import { queryOptions, useQuery } from '@tanstack/react-query';
import { checkInLookupDto, type CheckInLookupDto } from '@shared/schemas/shipping';
import { api } from '@/lib/api-client';
import { inboundKeys } from '@/lib/query-keys';

export function lookupBox(code: string, signal?: AbortSignal): Promise<CheckInLookupDto> {
  return api.get('/lab/check-in/lookup', { params: { code }, schema: checkInLookupDto, signal });
}

export function lookupBoxQueryOptions(code: string) {
  return queryOptions({ queryKey: inboundKeys.lookup(code), queryFn: ({ signal }) => lookupBox(code, signal), retry: false });
}

export function useLookupBox(code: string | null) {
  return useQuery({ ...lookupBoxQueryOptions(code ?? ''), enabled: Boolean(code) });
}
