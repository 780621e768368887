import { useEffect, useState } from 'react';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { photoKeys } from '@/lib/query-keys';

// Photos need the bearer token, so an <img src> cannot load them directly: they are
// fetched as blobs and shown from object URLs, which are released when no longer shown.

export function getPhoto(id: string, signal?: AbortSignal): Promise<Blob> {
  return api.get(`/photos/${encodeURIComponent(id)}`, { responseType: 'blob', signal });
}

export function getPhotoQueryOptions(id: string) {
  return queryOptions({
    queryKey: photoKeys.photo(id),
    queryFn: ({ signal }) => getPhoto(id, signal),
    // A stored photo never changes (content-addressed on the server).
    staleTime: Infinity,
  });
}

/** An object URL for the photo while the component shows it. */
export function usePhotoUrl(id: string): { url: string | null; isError: boolean } {
  const photo = useQuery(getPhotoQueryOptions(id));
  const [url, setUrl] = useState<string | null>(null);
  useEffect(() => {
    if (!photo.data) return;
    const objectUrl = URL.createObjectURL(photo.data);
    setUrl(objectUrl);
    return () => URL.revokeObjectURL(objectUrl);
  }, [photo.data]);
  return { url, isError: photo.isError };
}
