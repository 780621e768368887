import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { statementDetailDto } from '@shared/schemas/money';
import { api } from '@/lib/api-client';
import { settlementKeys } from './keys';

const retryResult = z.object({ outcome: z.object({ outcome: z.enum(['paid', 'failed', 'no_account', 'skipped']) }).passthrough(), statement: statementDetailDto });

/** Tries one payout again now (it is never paid twice: the provider and the statement both make sure). */
export function retryPayout(statementId: string) {
  return api.post(`/network/statements/${encodeURIComponent(statementId)}/retry`, { schema: retryResult });
}

export function useRetryPayout() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: retryPayout, onSuccess: () => queryClient.invalidateQueries({ queryKey: settlementKeys.all }) });
}
