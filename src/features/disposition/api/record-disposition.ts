import { useMutation, useQueryClient } from '@tanstack/react-query';
import { caseDispositionDto, recordDispositionInput, type CaseDispositionDto, type RecordDispositionInput } from '@shared/schemas/disposition';
import { api } from '@/lib/api-client';
import { benchKeys, caseKeys, caseRecordKeys } from '@/lib/query-keys';

export { recordDispositionInput };

export function recordDisposition(caseId: string, input: RecordDispositionInput): Promise<CaseDispositionDto> {
  return api.post(`/referrals/${encodeURIComponent(caseId)}/dispositions`, { body: input, schema: caseDispositionDto });
}

/** Recording the original media closes the case, so the case views are refreshed too. */
export function useRecordDisposition(caseId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: RecordDispositionInput) => recordDisposition(caseId, input),
    onSuccess: (result) => {
      queryClient.setQueryData(caseRecordKeys.dispositions(caseId), result);
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: caseRecordKeys.all }),
        queryClient.invalidateQueries({ queryKey: caseKeys.all }),
        queryClient.invalidateQueries({ queryKey: benchKeys.all }),
      ]);
    },
  });
}
