import { useMutation, useQueryClient } from '@tanstack/react-query';
import { appendCustodyInput, custodyEntryDto, type AppendCustodyInput, type CustodyEntryDto } from '@shared/schemas/custody';
import { api } from '@/lib/api-client';
import { caseRecordKeys } from '@/lib/query-keys';

export { appendCustodyInput };

export function recordCustody(caseId: string, input: AppendCustodyInput): Promise<CustodyEntryDto> {
  return api.post(`/referrals/${encodeURIComponent(caseId)}/custody`, { body: input, schema: custodyEntryDto });
}

export function useRecordCustody(caseId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: AppendCustodyInput) => recordCustody(caseId, input),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: caseRecordKeys.custody(caseId) }),
  });
}
