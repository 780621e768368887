import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { labSummaryDto, type LabSummaryDto } from '@shared/schemas/labs';
import type { LabSkill } from '@shared/vocabulary';
import { api } from '@/lib/api-client';
import { networkKeys } from '@/lib/query-keys';

const labListSchema = z.array(labSummaryDto);

/** Every lab of the network, or those offering one skill. */
export function getLabs(skill: LabSkill | undefined, signal?: AbortSignal): Promise<LabSummaryDto[]> {
  return api.get('/network/labs', { params: { skill }, schema: labListSchema, signal });
}

export function getLabsQueryOptions(skill?: LabSkill) {
  return queryOptions({
    queryKey: networkKeys.labList({ skill }),
    queryFn: ({ signal }) => getLabs(skill, signal),
    placeholderData: keepPreviousData,
  });
}

export function useLabs(skill?: LabSkill) {
  return useQuery(getLabsQueryOptions(skill));
}
