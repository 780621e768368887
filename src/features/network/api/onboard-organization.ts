import { useMutation, useQueryClient } from '@tanstack/react-query';
import { onboardedOrganizationDto, type OnboardedOrganizationDto, type OnboardOrganizationInput } from '@shared/schemas/organizations';
import { api } from '@/lib/api-client';
import { networkKeys } from '@/lib/query-keys';

export function onboardOrganization(input: OnboardOrganizationInput): Promise<OnboardedOrganizationDto> {
  return api.post('/network/organizations', { body: input, schema: onboardedOrganizationDto });
}

export function useOnboardOrganization() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: onboardOrganization,
    // Returned so the mutation stays pending until the shops' or labs' list shows the newcomer.
    onSuccess: (done) => queryClient.invalidateQueries({ queryKey: done.organization.kind === 'lab' ? networkKeys.labs() : networkKeys.partners() }),
  });
}
