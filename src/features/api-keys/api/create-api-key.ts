import { useMutation, useQueryClient } from '@tanstack/react-query';
import { createApiKeyInput, createdApiKeyDto, type CreateApiKeyInput, type CreatedApiKeyDto } from '@shared/schemas/partner-api';
import { api } from '@/lib/api-client';
import { apiKeyKeys } from '@/lib/query-keys';

export { createApiKeyInput };

/** The answer holds the whole key, the only time it is ever sent; it is never cached. */
export function createApiKey(input: CreateApiKeyInput): Promise<CreatedApiKeyDto> {
  return api.post('/partner/api-keys', { body: input, schema: createdApiKeyDto });
}

export function useCreateApiKey() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createApiKey,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: apiKeyKeys.all }),
  });
}
