import sharp, { type Metadata, type Sharp } from 'sharp';

/** Formats a photo may arrive in, judged by its bytes, never by its name or declared type. */
export type PhotoFormat = 'jpeg' | 'png' | 'webp';

/** At most this many pixels are decoded: 100 Mpx (about 300 MB as RGB) covers phone and DSLR photos. */
export const MAX_PHOTO_PIXELS = 100_000_000;
/** Longest edge of the thumbnail, px. */
export const THUMB_EDGE_PX = 320;
/** Longest edge of the web-size copy, px. */
export const WEB_EDGE_PX = 1600;
const THUMB_QUALITY = 75;
const WEB_QUALITY = 82;
const FULL_QUALITY = 90;
/** Thumbnail and web copy are JPEG with no transparency: transparent areas become white. */
const FLATTEN_BACKGROUND = '#ffffff';

/** Why an upload is not a photo we keep. */
export type PhotoRejection = 'not-an-image' | 'too-many-pixels' | 'unreadable';

/** A refused upload (domain error; the HTTP layer picks the status). */
export class PhotoRejectedError extends Error {
  constructor(readonly reason: PhotoRejection, message: string) {
    super(message);
    this.name = 'PhotoRejectedError';
  }
}

const JPEG_MAGIC = [0xff, 0xd8, 0xff];
const PNG_MAGIC = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];
const RIFF = 'RIFF';
const WEBP = 'WEBP';
const WEBP_TAG_OFFSET = 8;

const startsWith = (bytes: Buffer, magic: number[]) => magic.every((byte, i) => bytes[i] === byte);

/** The image format the first bytes announce (JPEG, PNG or WebP signatures), or null. */
export function sniffPhotoFormat(bytes: Buffer): PhotoFormat | null {
  if (startsWith(bytes, JPEG_MAGIC)) return 'jpeg';
  if (startsWith(bytes, PNG_MAGIC)) return 'png';
  const riff = bytes.subarray(0, RIFF.length).toString('latin1');
  const webp = bytes.subarray(WEBP_TAG_OFFSET, WEBP_TAG_OFFSET + WEBP.length).toString('latin1');
  if (riff === RIFF && webp === WEBP) return 'webp';
  return null;
}

/** The three stored copies of one photo, every one re-encoded without any metadata. */
export interface ProcessedPhoto {
  format: PhotoFormat;
  widthPx: number;
  heightPx: number;
  full: Buffer;
  web: Buffer;
  thumb: Buffer;
}

const decoder = (bytes: Buffer) => sharp(bytes, { limitInputPixels: MAX_PHOTO_PIXELS, failOn: 'error' });

/**
 * Checks an upload and makes its copies. The header is read first (no pixels decoded), so a
 * file claiming huge dimensions (a decompression bomb) is refused before any large allocation.
 * sharp writes no EXIF, XMP, IPTC or ICC block unless asked to, so location and camera data
 * are dropped from every copy; the EXIF orientation is applied to the pixels first.
 */
export async function processPhoto(bytes: Buffer): Promise<ProcessedPhoto> {
  const sniffed = sniffPhotoFormat(bytes);
  if (!sniffed) throw new PhotoRejectedError('not-an-image', 'Not a JPEG, PNG or WebP image (judged by the file content)');
  let meta: Metadata;
  try {
    meta = await sharp(bytes, { limitInputPixels: false }).metadata();
  } catch {
    throw new PhotoRejectedError('unreadable', `The ${sniffed.toUpperCase()} file could not be read`);
  }
  if (meta.format !== sniffed || !meta.width || !meta.height) {
    throw new PhotoRejectedError('unreadable', `The ${sniffed.toUpperCase()} file could not be read`);
  }
  if (meta.width * meta.height > MAX_PHOTO_PIXELS || (meta.pages ?? 1) > 1) {
    throw new PhotoRejectedError('too-many-pixels', `The image is ${meta.width} × ${meta.height} px${(meta.pages ?? 1) > 1 ? ` in ${meta.pages} frames` : ''}; at most ${MAX_PHOTO_PIXELS / 1e6} million pixels in one frame are accepted`);
  }
  try {
    // Each copy decodes the source on its own: JPEG shrink-on-load keeps the small ones cheap,
    // and no full-size raw bitmap is held in memory between steps.
    const base = () => decoder(bytes).autoOrient();
    const full = await encodeFull(base(), sniffed).toBuffer({ resolveWithObject: true });
    const web = await base().resize(WEB_EDGE_PX, WEB_EDGE_PX, { fit: 'inside', withoutEnlargement: true })
      .flatten({ background: FLATTEN_BACKGROUND }).jpeg({ quality: WEB_QUALITY, mozjpeg: true }).toBuffer();
    const thumb = await base().resize(THUMB_EDGE_PX, THUMB_EDGE_PX, { fit: 'inside', withoutEnlargement: true })
      .flatten({ background: FLATTEN_BACKGROUND }).jpeg({ quality: THUMB_QUALITY, mozjpeg: true }).toBuffer();
    return { format: sniffed, widthPx: full.info.width, heightPx: full.info.height, full: full.data, web, thumb };
  } catch {
    // A header that reads but pixels that do not (truncated, corrupt): not a photo we keep.
    throw new PhotoRejectedError('unreadable', `The ${sniffed.toUpperCase()} file is damaged and could not be decoded`);
  }
}

function encodeFull(image: Sharp, format: PhotoFormat): Sharp {
  if (format === 'png') return image.png();
  if (format === 'webp') return image.webp({ quality: FULL_QUALITY });
  return image.jpeg({ quality: FULL_QUALITY });
}
