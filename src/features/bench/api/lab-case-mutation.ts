import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { LabCaseDto } from '@shared/schemas/lab-work';
import { benchKeys, caseKeys } from '@/lib/query-keys';

/**
 * Every change on the bench answers with the whole case: it goes straight into the cache, and the
 * queue (and any shop-side view in this browser) is refreshed before the mutation counts as done.
 */
export function useLabCaseMutation<V>(mutationFn: (variables: V) => Promise<LabCaseDto>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn,
    onSuccess: (labCase) => {
      queryClient.setQueryData(benchKeys.case(labCase.id), labCase);
      return Promise.all([queryClient.invalidateQueries({ queryKey: benchKeys.lists() }), queryClient.invalidateQueries({ queryKey: caseKeys.all })]);
    },
  });
}
