import bwipjs from 'bwip-js/node';
import { describe, expect, it } from 'vitest';
import { detectPhotoType } from './image-type';

// File signatures ("magic numbers") as the formats define them: JPEG starts with the SOI marker
// FF D8 FF (ITU-T T.81 / JFIF); PNG with the 8-byte signature 89 50 4E 47 0D 0A 1A 0A
// (ISO/IEC 15948); WebP is a RIFF container of form type "WEBP" (RFC 9649); HEIC/HEIF is an
// ISO base media file whose first box is "ftyp" with the major brand heic or mif1 (ISO/IEC 23008-12).
const jpeg = Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10]), Buffer.from('JFIF\0'), Buffer.alloc(64)]);
const webp = Buffer.concat([Buffer.from('RIFF'), Buffer.from([0x24, 0, 0, 0]), Buffer.from('WEBPVP8 '), Buffer.alloc(64)]);
const ftyp = (brand: string) =>
  Buffer.concat([Buffer.from([0, 0, 0, 0x18]), Buffer.from('ftyp'), Buffer.from(brand), Buffer.from([0, 0, 0, 0]), Buffer.from('mif1heic'), Buffer.alloc(64)]);

describe('photo type from content', () => {
  it('recognises a real PNG drawn by bwip-js', async () => {
    const png = await bwipjs.toBuffer({ bcid: 'code128', text: 'PP-TEST' });
    expect(await detectPhotoType(png)).toBe('image/png');
  });

  it('recognises JPEG, WebP and HEIC signatures', async () => {
    expect(await detectPhotoType(jpeg)).toBe('image/jpeg');
    expect(await detectPhotoType(webp)).toBe('image/webp');
    expect(await detectPhotoType(ftyp('heic'))).toBe('image/heic');
    expect(await detectPhotoType(ftyp('mif1'))).toBe('image/heif');
  });

  it('refuses text, whatever the file is called', async () => {
    expect(await detectPhotoType(Buffer.from('this is a note, renamed photo.jpg\n'))).toBeNull();
  });

  it('refuses other recognised types: a PDF and a GIF are not condition photos', async () => {
    expect(await detectPhotoType(Buffer.concat([Buffer.from('%PDF-1.7\n'), Buffer.alloc(64)]))).toBeNull();
    expect(await detectPhotoType(Buffer.concat([Buffer.from('GIF89a'), Buffer.alloc(64)]))).toBeNull();
  });
});
