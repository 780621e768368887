import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { apiDocumentKeys } from '@/lib/query-keys';
import type { OpenApiDocument } from '../utils/openapi';

/** The partner API's OpenAPI document; public, so no session is needed to read it. */
export function getApiDocument(signal?: AbortSignal): Promise<OpenApiDocument> {
  return api.get<OpenApiDocument>('/v1/openapi.json', { signal, auth: false });
}

export function getApiDocumentQueryOptions() {
  return queryOptions({ queryKey: apiDocumentKeys.all, queryFn: ({ signal }) => getApiDocument(signal), staleTime: 5 * 60_000 });
}

export function useApiDocument() {
  return useQuery(getApiDocumentQueryOptions());
}
