import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import {
  commissionPlanDto,
  commissionPlanListDto,
  type CommissionPlanDto,
  type CommissionPlanInput,
  type CommissionPlanPatch,
} from '@shared/schemas/money';
import { api } from '@/lib/api-client';
import { networkKeys } from '@/lib/query-keys';

// The network admin's commission plans and the shops on each (every change is audited on the server).

export const partnerRowDto = z.object({
  id: z.uuid(),
  name: z.string(),
  address: z.object({ city: z.string().nullable(), region: z.string().nullable() }),
  active: z.boolean(),
});
export type PartnerRow = z.infer<typeof partnerRowDto>;

export function getCommissionPlans(signal?: AbortSignal) {
  return api.get('/network/commission-plans', { schema: commissionPlanListDto, signal });
}

export function getCommissionPlansQueryOptions() {
  return queryOptions({ queryKey: networkKeys.commissionPlans(), queryFn: ({ signal }) => getCommissionPlans(signal) });
}

export function getPartners(signal?: AbortSignal) {
  return api.get('/network/organizations', { params: { kind: 'partner' }, schema: z.array(partnerRowDto), signal });
}

export function getPartnersQueryOptions() {
  return queryOptions({ queryKey: networkKeys.partners(), queryFn: ({ signal }) => getPartners(signal) });
}

export const useCommissionPlans = () => useQuery(getCommissionPlansQueryOptions());
export const usePartners = () => useQuery(getPartnersQueryOptions());

function useInvalidatingMutation<I, O>(mutationFn: (input: I) => Promise<O>) {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn, onSuccess: () => queryClient.invalidateQueries({ queryKey: networkKeys.commissionPlans() }) });
}

export const useCreateCommissionPlan = () =>
  useInvalidatingMutation((input: CommissionPlanInput): Promise<CommissionPlanDto> => api.post('/network/commission-plans', { body: input, schema: commissionPlanDto }));

export const useUpdateCommissionPlan = () =>
  useInvalidatingMutation(({ id, patch }: { id: string; patch: CommissionPlanPatch }): Promise<CommissionPlanDto> =>
    api.patch(`/network/commission-plans/${encodeURIComponent(id)}`, { body: patch, schema: commissionPlanDto }),
  );

/** `planId: null` puts the shop back on the default plan. */
export const useAssignCommissionPlan = () =>
  useInvalidatingMutation(({ partnerId, planId }: { partnerId: string; planId: string | null }) =>
    api.put(`/network/partners/${encodeURIComponent(partnerId)}/commission-plan`, { body: { planId } }),
  );
