import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiKeyDto, type ApiKeyDto } from '@shared/schemas/partner-api';
import { api } from '@/lib/api-client';
import { benchKeys } from '@/lib/query-keys';

export function revokeToolKey(id: string): Promise<ApiKeyDto> {
  return api.delete(`/lab/api-keys/${encodeURIComponent(id)}`, { schema: apiKeyDto });
}

export function useRevokeToolKey() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: revokeToolKey, onSuccess: () => queryClient.invalidateQueries({ queryKey: benchKeys.toolKeys() }) });
}
