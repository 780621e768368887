import { useState } from 'react';
import type { ReferralDto } from '@shared/schemas/referrals';
import { Button } from '@/components/ui/button';
import { Input } from '@/components/ui/input';
import { Spinner } from '@/components/ui/spinner';
import { toast } from '@/components/ui/toast';
import { isApiError } from '@/lib/api-client';
import { Can } from '@/lib/auth';
import { formatFileSize } from '@/lib/format';
import { usePhotoUrl } from '../api/get-photo';
import { PHOTO_MAX_BYTES, PHOTOS_PER_REFERRAL, photoContentTypes, photoProblems, useUploadPhotos } from '../api/upload-photos';

type Photo = Pick<ReferralDto['photos'][number], 'id'>;

function PhotoThumb({ photo, index }: { photo: Photo; index: number }) {
  const { url, isError } = usePhotoUrl(photo.id);
  const alt = `Condition photo ${index + 1}`;
  return (
    <li className="flex aspect-square w-32 items-center justify-center overflow-hidden rounded-control border border-ink-hairline bg-paper-sunken">
      {url ? (
        <a href={url} target="_blank" rel="noreferrer" className="focus-ring block size-full" aria-label={`${alt}, open full size`}>
          <img src={url} alt={alt} className="size-full object-cover" />
        </a>
      ) : isError ? (
        <span className="px-2 text-center text-xs text-ink-muted">{alt} could not be loaded</span>
      ) : (
        <Spinner label={`Loading ${alt.toLowerCase()}`} />
      )}
    </li>
  );
}

/** Condition photos as thumbnails that open full size; read-only. */
export function PhotoGallery({ photos }: { photos: readonly Photo[] }) {
  if (photos.length === 0) return <p className="text-sm text-ink-muted">No photos yet.</p>;
  return (
    <ul className="flex flex-wrap gap-3" aria-label="Condition photos">
      {photos.map((photo, index) => (
        <PhotoThumb key={photo.id} photo={photo} index={index} />
      ))}
    </ul>
  );
}

/** The case's condition photos and, for the shop, a way to add more. */
export function CasePhotos({ referral, canAdd }: { referral: ReferralDto; canAdd: boolean }) {
  const upload = useUploadPhotos();
  const [files, setFiles] = useState<File[]>([]);
  const [inputKey, setInputKey] = useState(0);
  const [serverError, setServerError] = useState<string | null>(null);
  const problems = photoProblems(files, referral.photos.length);
  const room = PHOTOS_PER_REFERRAL - referral.photos.length;

  return (
    <div className="flex flex-col gap-4">
      <PhotoGallery photos={referral.photos} />
      {canAdd && room > 0 ? (
        <Can permission="photos.upload">
          <form
            className="flex flex-wrap items-end gap-3"
            onSubmit={async (event) => {
              event.preventDefault();
              if (files.length === 0 || problems.length > 0) return;
              setServerError(null);
              try {
                await upload.mutateAsync({ referralId: referral.id, files });
                toast.success(files.length === 1 ? 'Photo added' : `${files.length} photos added`);
                setFiles([]);
                setInputKey((k) => k + 1);
              } catch (error) {
                if (isApiError(error) && !error.isUnexpected) setServerError(error.message);
              }
            }}
          >
            <Input
              key={inputKey}
              label="Add photos"
              type="file"
              multiple
              accept={photoContentTypes.join(',')}
              className="min-w-64 flex-1 [&_input]:h-auto [&_input]:py-2"
              hint={`${room} more ${room === 1 ? 'photo' : 'photos'} at most, ${formatFileSize(PHOTO_MAX_BYTES)} each.`}
              error={[...problems, serverError].filter(Boolean).join(' ') || undefined}
              onChange={(event) => {
                setServerError(null);
                setFiles(Array.from(event.target.files ?? []));
              }}
            />
            <Button type="submit" variant="secondary" disabled={files.length === 0} isLoading={upload.isPending}>
              Upload
            </Button>
          </form>
        </Can>
      ) : null}
    </div>
  );
}
