import { useMutation, useQueryClient } from '@tanstack/react-query';
import { organizationDto, type OrganizationActiveInput, type OrganizationDto } from '@shared/schemas/organizations';
import { api } from '@/lib/api-client';
import { networkKeys } from '@/lib/query-keys';

export function setOrganizationActive({ id, ...input }: OrganizationActiveInput & { id: string }): Promise<OrganizationDto> {
  return api.put(`/network/organizations/${encodeURIComponent(id)}/active`, { body: input, schema: organizationDto });
}

export function useSetOrganizationActive() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: setOrganizationActive,
    // A lab switched off also changes cases (its open offers move on), so everything the network sees is read again.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: networkKeys.all }),
  });
}
