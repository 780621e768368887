import { fileTypeFromBuffer } from 'file-type';
import { photoContentTypes } from '@shared/schemas/partner-api';

export type PhotoContentType = (typeof photoContentTypes)[number];

/**
 * The image type from the bytes themselves (their signature), never from the file name or the
 * declared Content-Type, both of which the sender chooses. HEIC photos come as `image/heic`
 * (brands heic/heix) or as generic HEIF (brand mif1); both are accepted.
 */
export async function detectPhotoType(bytes: Uint8Array): Promise<PhotoContentType | null> {
  const found = await fileTypeFromBuffer(bytes);
  if (!found) return null;
  return (photoContentTypes as readonly string[]).includes(found.mime) ? (found.mime as PhotoContentType) : null;
}

export const photoExtensions: Record<PhotoContentType, string> = {
  'image/jpeg': 'jpg',
  'image/png': 'png',
  'image/webp': 'webp',
  'image/heic': 'heic',
  'image/heif': 'heif',
};
