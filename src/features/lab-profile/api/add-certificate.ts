import { useMutation, useQueryClient } from '@tanstack/react-query';
import { cleanAirCertificateDto, cleanAirCertificateInput, type CleanAirCertificateDto } from '@shared/schemas/labs';
import { api } from '@/lib/api-client';
import { labProfileKeys } from '@/lib/query-keys';

export { cleanAirCertificateInput };

export type CertificateInput = ReturnType<typeof cleanAirCertificateInput.parse>;

/** Records the particle counts of a test; the server works out the ISO class and the re-test date. */
export function addCertificate(input: CertificateInput): Promise<CleanAirCertificateDto> {
  return api.post('/lab/profile/certificates', { body: input, schema: cleanAirCertificateDto });
}

export function useAddCertificate() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: addCertificate,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: labProfileKeys.all }),
  });
}
