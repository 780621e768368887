import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { apiKeyDto, type ApiKeyDto } from '@shared/schemas/partner-api';
import { api } from '@/lib/api-client';
import { apiKeyKeys } from '@/lib/query-keys';

const apiKeyListSchema = z.array(apiKeyDto);

export function getApiKeys(signal?: AbortSignal): Promise<ApiKeyDto[]> {
  return api.get('/partner/api-keys', { schema: apiKeyListSchema, signal });
}

export function getApiKeysQueryOptions() {
  return queryOptions({ queryKey: apiKeyKeys.lists(), queryFn: ({ signal }) => getApiKeys(signal) });
}

export function useApiKeys() {
  return useQuery(getApiKeysQueryOptions());
}
