import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { apiKeyDto, type ApiKeyDto } from '@shared/schemas/partner-api';
import { api } from '@/lib/api-client';
import { benchKeys } from '@/lib/query-keys';

// The lab's tooling keys: its imagers and recovery software post progress and file lists with them.

const listDto = z.object({ data: z.array(apiKeyDto) });

export function getToolKeys(signal?: AbortSignal): Promise<ApiKeyDto[]> {
  return api.get('/lab/api-keys', { schema: listDto, signal }).then((list) => list.data);
}

export function getToolKeysQueryOptions() {
  return queryOptions({ queryKey: benchKeys.toolKeys(), queryFn: ({ signal }) => getToolKeys(signal) });
}

export function useToolKeys() {
  return useQuery(getToolKeysQueryOptions());
}
