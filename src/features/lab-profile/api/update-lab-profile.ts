import { useMutation, useQueryClient } from '@tanstack/react-query';
import { labProfileDto, labProfileInput, type LabProfileDto, type LabProfileInputParsed } from '@shared/schemas/labs';
import { api } from '@/lib/api-client';
import { labProfileKeys, offerKeys } from '@/lib/query-keys';

export { labProfileInput };

export function updateLabProfile(input: LabProfileInputParsed): Promise<LabProfileDto> {
  return api.put('/lab/profile', { body: input, schema: labProfileDto });
}

export function useUpdateLabProfile() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateLabProfile,
    onSuccess: (profile) => {
      queryClient.setQueryData(labProfileKeys.own(), profile);
      return Promise.all([queryClient.invalidateQueries({ queryKey: labProfileKeys.all }), queryClient.invalidateQueries({ queryKey: offerKeys.all })]);
    },
  });
}
