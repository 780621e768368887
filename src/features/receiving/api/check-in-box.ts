import { useMutation, useQueryClient } from '@tanstack/react-query';
import { checkInInput, checkInResultDto, type CheckInInput, type CheckInResultDto } from '@shared/schemas/shipping';
import { api } from '@/lib/api-client';
import { caseKeys, inboundKeys, shipmentKeys } from '@/lib/query-keys';

export { checkInInput };

/** The check-in as multipart: the JSON in `data`, the photos in `photos`. */
export function checkInBox({ input, photos }: { input: CheckInInput; photos: readonly File[] }): Promise<CheckInResultDto> {
  const body = new FormData();
  body.append('data', JSON.stringify(input));
  for (const photo of photos) body.append('photos', photo, photo.name);
  return api.post('/lab/check-ins', { body, schema: checkInResultDto });
}

export function useCheckInBox() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: checkInBox,
    onSuccess: () =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: inboundKeys.all }),
        queryClient.invalidateQueries({ queryKey: shipmentKeys.all }),
        queryClient.invalidateQueries({ queryKey: caseKeys.all }),
      ]),
  });
}
