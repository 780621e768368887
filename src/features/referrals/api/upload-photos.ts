import { useMutation, useQueryClient } from '@tanstack/react-query';
import { PHOTO_MAX_BYTES, PHOTOS_PER_REFERRAL, photoContentTypes } from '@shared/schemas/partner-api';
import { api } from '@/lib/api-client';
import { caseKeys } from '@/lib/query-keys';
import { formatFileSize } from '@/lib/format';

export { PHOTO_MAX_BYTES, PHOTOS_PER_REFERRAL, photoContentTypes };

/**
 * What the server will refuse, said before the upload. The server decides from the bytes;
 * this only saves the clerk a wasted upload of a PDF or a 30 MB file.
 */
export function photoProblems(files: readonly File[], alreadyStored = 0): string[] {
  const problems: string[] = [];
  if (files.length + alreadyStored > PHOTOS_PER_REFERRAL) {
    problems.push(`A case holds at most ${PHOTOS_PER_REFERRAL} photos${alreadyStored ? ` (it has ${alreadyStored} already)` : ''}.`);
  }
  for (const file of files) {
    if (file.type && !(photoContentTypes as readonly string[]).includes(file.type)) {
      problems.push(`${file.name} is not a photo (JPEG, PNG, WebP or HEIC).`);
    } else if (file.size > PHOTO_MAX_BYTES) {
      problems.push(`${file.name} is ${formatFileSize(file.size)}; each photo may be at most ${formatFileSize(PHOTO_MAX_BYTES)}.`);
    }
  }
  return problems;
}

export function uploadPhotos({ referralId, files }: { referralId: string; files: readonly File[] }): Promise<unknown> {
  const body = new FormData();
  for (const file of files) body.append('photos', file, file.name);
  return api.post(`/referrals/${encodeURIComponent(referralId)}/photos`, { body });
}

export function useUploadPhotos() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: uploadPhotos,
    onSuccess: (_photos, { referralId }) => queryClient.invalidateQueries({ queryKey: caseKeys.detail(referralId) }),
  });
}
