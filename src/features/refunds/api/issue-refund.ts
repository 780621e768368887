import { useMutation, useQueryClient } from '@tanstack/react-query';
import { labCaseDto, type LabCaseDto, type RefundInput } from '@shared/schemas/lab-work';
import { api } from '@/lib/api-client';
import { benchKeys, caseKeys } from '@/lib/query-keys';

/** One key per refund the manager means to make: a retry of the same submission refunds once. */
export function issueRefund({ id, values, idempotencyKey }: { id: string; values: RefundInput; idempotencyKey: string }): Promise<LabCaseDto> {
  return api.post(`/lab/cases/${encodeURIComponent(id)}/refunds`, { body: values, headers: { 'Idempotency-Key': idempotencyKey }, schema: labCaseDto });
}

export function useIssueRefund() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: issueRefund,
    onSuccess: (labCase) => {
      queryClient.setQueryData(benchKeys.case(labCase.id), labCase);
      return queryClient.invalidateQueries({ queryKey: caseKeys.all });
    },
  });
}
