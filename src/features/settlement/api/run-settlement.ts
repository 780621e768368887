import { useMutation, useQueryClient } from '@tanstack/react-query';
import { settlementRunDto, settlementRunInput, type SettlementRunDto, type SettlementRunInput } from '@shared/schemas/money';
import { api } from '@/lib/api-client';
import { settlementKeys } from './keys';

export { settlementRunInput };

export function runSettlement(input: SettlementRunInput): Promise<SettlementRunDto> {
  return api.post('/network/settlements', { body: input, schema: settlementRunDto });
}

export function useRunSettlement() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: runSettlement,
    // Returned so the button stays busy until the page shows the run's results.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: settlementKeys.all }),
  });
}
