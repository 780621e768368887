import { queryOptions, useQuery } from '@tanstack/react-query';
import { labProfileDto, type LabProfileDto } from '@shared/schemas/labs';
import { api } from '@/lib/api-client';
import { labProfileKeys } from '@/lib/query-keys';

export function getLabProfile(signal?: AbortSignal): Promise<LabProfileDto> {
  return api.get('/lab/profile', { schema: labProfileDto, signal });
}

export function getLabProfileQueryOptions() {
  return queryOptions({ queryKey: labProfileKeys.own(), queryFn: ({ signal }) => getLabProfile(signal) });
}

export function useLabProfile() {
  return useQuery(getLabProfileQueryOptions());
}
