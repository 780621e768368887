import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { staffMemberSchema, type StaffMember } from '@shared/schemas/auth';
import { api } from '@/lib/api-client';
import { staffKeys } from '@/lib/query-keys';

const staffListSchema = z.array(staffMemberSchema);

export function getStaff(signal?: AbortSignal): Promise<StaffMember[]> {
  return api.get('/organization/staff', { schema: staffListSchema, signal });
}

export function getStaffQueryOptions() {
  return queryOptions({
    queryKey: staffKeys.lists(),
    queryFn: ({ signal }) => getStaff(signal),
  });
}

export function useStaff() {
  return useQuery(getStaffQueryOptions());
}
