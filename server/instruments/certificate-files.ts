import { randomBytes } from 'node:crypto';
import { mkdir, readFile, rm, writeFile } from 'node:fs/promises';
import { join } from 'node:path';

/** Largest certificate accepted, bytes (10 MB: a scanned multi-page PDF). */
export const CERTIFICATE_MAX_BYTES = 10 * 1024 * 1024;
const NAME_BYTES = 16;
/** File signatures (magic numbers): PDF `%PDF-` (ISO 32000-1, 7.5.2), PNG (RFC 2083, 3.1), JPEG SOI + marker (common practice). */
const SIGNATURES: { type: string; bytes: number[] }[] = [
  { type: 'application/pdf', bytes: [0x25, 0x50, 0x44, 0x46, 0x2d] },
  { type: 'image/png', bytes: [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a] },
  { type: 'image/jpeg', bytes: [0xff, 0xd8, 0xff] },
];

/** The content type a certificate's bytes show (PDF, PNG or JPEG), or undefined for anything else. */
export function certificateType(bytes: Buffer): string | undefined {
  return SIGNATURES.find((s) => s.bytes.every((b, i) => bytes[i] === b))?.type;
}

/** Calibration certificates on disk under `<dataDir>/uploads/certificates/`, with random names. */
export class CertificateFiles {
  private readonly dir: string;

  constructor(dataDir: string) {
    // Under uploads/, which backups copy (server/backup/backup-service.ts).
    this.dir = join(dataDir, 'uploads', 'certificates');
  }

  /** Writes the bytes under a new random name; returns the name. */
  async save(bytes: Buffer): Promise<string> {
    await mkdir(this.dir, { recursive: true });
    const name = `${randomBytes(NAME_BYTES).toString('hex')}.bin`;
    await writeFile(join(this.dir, name), bytes, { flag: 'wx' });
    return name;
  }

  /** Reads a stored certificate. */
  read(name: string): Promise<Buffer> {
    return readFile(join(this.dir, name));
  }

  /** Deletes a stored certificate (a missing file is fine). */
  async remove(name: string): Promise<void> {
    await rm(join(this.dir, name), { force: true });
  }
}
