import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { createLabKeyInput } from '@shared/schemas/lab-work';
import { createdApiKeyDto, type CreatedApiKeyDto } from '@shared/schemas/partner-api';
import { api } from '@/lib/api-client';
import { benchKeys } from '@/lib/query-keys';

export { createLabKeyInput };

/** The answer holds the whole key: the only time it is ever shown. */
export function createToolKey(values: z.output<typeof createLabKeyInput>): Promise<CreatedApiKeyDto> {
  return api.post('/lab/api-keys', { body: values, schema: createdApiKeyDto });
}

export function useCreateToolKey() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: createToolKey, onSuccess: () => queryClient.invalidateQueries({ queryKey: benchKeys.toolKeys() }) });
}
