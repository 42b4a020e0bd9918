import { randomBytes } from 'node:crypto';
import { mkdirSync } from 'node:fs';
import { unlink, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { PhotoFormat, ProcessedPhoto } from './photo-processing.js';

/** The stored copies of a photo: thumbnail, web size, full size. */
export const PHOTO_VARIANTS = ['thumb', 'web', 'full'] as const;
export type PhotoVariant = (typeof PHOTO_VARIANTS)[number];

const KEY_BYTES = 16;
const EXTENSION: Record<PhotoFormat, string> = { jpeg: 'jpg', png: 'png', webp: 'webp' };
/** Content type of each stored format. */
export const PHOTO_CONTENT_TYPE: Record<PhotoFormat, string> = { jpeg: 'image/jpeg', png: 'image/png', webp: 'image/webp' };

/** The format a variant is stored in: thumbnail and web copy are always JPEG. */
export const variantFormat = (variant: PhotoVariant, fullFormat: PhotoFormat): PhotoFormat => (variant === 'full' ? fullFormat : 'jpeg');

/**
 * Photo files under `<dataDir>/photos`, named by a random key only (never by anything the
 * uploader sent), so no name can reach outside the folder or collide with another.
 */
export class PhotoFiles {
  readonly dir: string;

  constructor(dataDir: string) {
    this.dir = join(dataDir, 'photos');
    mkdirSync(this.dir, { recursive: true });
  }

  /** A fresh random storage key (32 hex digits). */
  newKey(): string {
    return randomBytes(KEY_BYTES).toString('hex');
  }

  /** Absolute path of one stored copy. */
  pathOf(key: string, variant: PhotoVariant, fullFormat: PhotoFormat): string {
    if (!/^[0-9a-f]{32}$/.test(key)) throw new Error('Invalid photo storage key');
    return join(this.dir, `${key}-${variant}.${EXTENSION[variantFormat(variant, fullFormat)]}`);
  }

  /** Writes every copy; on any failure removes those already written and rethrows. */
  async write(key: string, photo: ProcessedPhoto): Promise<void> {
    const written: string[] = [];
    try {
      for (const variant of PHOTO_VARIANTS) {
        const path = this.pathOf(key, variant, photo.format);
        await writeFile(path, photo[variant], { flag: 'wx' });
        written.push(path);
      }
    } catch (error) {
      await Promise.all(written.map((path) => unlink(path).catch(() => undefined)));
      throw error;
    }
  }

  /** Removes every copy of a photo (missing files are not an error). */
  async remove(key: string, fullFormat: PhotoFormat): Promise<void> {
    await Promise.all(PHOTO_VARIANTS.map((variant) => unlink(this.pathOf(key, variant, fullFormat)).catch(() => undefined)));
  }
}
