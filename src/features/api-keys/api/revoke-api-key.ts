import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiKeyDto, type ApiKeyDto } from '@shared/schemas/partner-api';
import { api } from '@/lib/api-client';
import { apiKeyKeys } from '@/lib/query-keys';

export function revokeApiKey(id: string): Promise<ApiKeyDto> {
  return api.delete(`/partner/api-keys/${encodeURIComponent(id)}`, { schema: apiKeyDto });
}

export function useRevokeApiKey() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: revokeApiKey,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: apiKeyKeys.all }),
  });
}
