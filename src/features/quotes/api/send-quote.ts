import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { labCaseDto, quoteFormSchema, sendQuoteInput, toSendQuoteInput, type LabCaseDto } from '@shared/schemas/lab-work';
import { api } from '@/lib/api-client';
import { benchKeys, caseKeys } from '@/lib/query-keys';

export { quoteFormSchema, toSendQuoteInput };

export function sendQuote({ id, values }: { id: string; values: z.output<typeof sendQuoteInput> }): Promise<LabCaseDto> {
  return api.post(`/lab/cases/${encodeURIComponent(id)}/quote`, { body: values, schema: labCaseDto });
}

export function useSendQuote() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: sendQuote,
    onSuccess: (labCase) => {
      queryClient.setQueryData(benchKeys.case(labCase.id), labCase);
      return Promise.all([queryClient.invalidateQueries({ queryKey: benchKeys.lists() }), queryClient.invalidateQueries({ queryKey: caseKeys.all })]);
    },
  });
}
