import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { PhotoRejectedError, processPhoto, sniffPhotoFormat } from './photo-processing.js';

describe('sniffPhotoFormat', () => {
  it('knows the three signatures and nothing else', async () => {
    // Signatures: JPEG SOI FF D8 FF (ITU T.81), PNG 89 50 4E 47 0D 0A 1A 0A (RFC 2083), WebP "RIFF....WEBP" (RFC 9649).
    const image = sharp({ create: { width: 4, height: 4, channels: 3, background: '#123456' } });
    expect(sniffPhotoFormat(await image.clone().jpeg().toBuffer())).toBe('jpeg');
    expect(sniffPhotoFormat(await image.clone().png().toBuffer())).toBe('png');
    expect(sniffPhotoFormat(await image.clone().webp().toBuffer())).toBe('webp');
    expect(sniffPhotoFormat(await image.clone().gif().toBuffer())).toBeNull();
    expect(sniffPhotoFormat(Buffer.from('RIFF\0\0\0\0WAVEfmt '))).toBeNull();
    expect(sniffPhotoFormat(Buffer.alloc(0))).toBeNull();
  });
});

describe('processPhoto', () => {
  it('turns the pixels upright before the orientation tag is dropped with the rest of the metadata', async () => {
    // EXIF Orientation 6 = "rotate 90° clockwise to display" (EXIF 2.32, tag 0x0112): a 40 × 20 sensor image shows 20 × 40.
    const sideways = await sharp({ create: { width: 40, height: 20, channels: 3, background: '#808080' } }).jpeg().withMetadata({ orientation: 6 }).toBuffer();
    expect((await sharp(sideways).metadata()).orientation).toBe(6);
    const photo = await processPhoto(sideways);
    expect([photo.widthPx, photo.heightPx]).toEqual([20, 40]);
    const full = await sharp(photo.full).metadata();
    expect([full.width, full.height, full.orientation, full.exif]).toEqual([20, 40, undefined, undefined]);
  });

  it('never enlarges a small photo', async () => {
    const small = await sharp({ create: { width: 200, height: 100, channels: 3, background: '#808080' } }).png().toBuffer();
    const photo = await processPhoto(small);
    const [web, thumb] = await Promise.all([sharp(photo.web).metadata(), sharp(photo.thumb).metadata()]);
    expect([web.width, web.height, web.format, thumb.width, thumb.format]).toEqual([200, 100, 'jpeg', 200, 'jpeg']);
    expect((await sharp(photo.full).metadata()).format).toBe('png');
  });

  it('refuses bytes that are no image with a reason', async () => {
    await expect(processPhoto(Buffer.from('%PDF-1.7 not a photo'))).rejects.toMatchObject({ reason: 'not-an-image' });
    await expect(processPhoto(Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0, 0]))).rejects.toBeInstanceOf(PhotoRejectedError);
  });
});
