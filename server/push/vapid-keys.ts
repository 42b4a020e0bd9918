import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import webpush from 'web-push';
import { z } from 'zod';

/** File under the data directory that holds this server's VAPID key pair. */
export const VAPID_FILE = 'vapid-keys.json';

const VapidFileSchema = z.object({ publicKey: z.string().min(80), privateKey: z.string().min(40) });
/** The server's VAPID key pair (RFC 8292), base64url as the web-push package writes them. */
export type VapidKeys = z.infer<typeof VapidFileSchema>;

/**
 * The VAPID keys made on first start and kept in DATA_DIR/vapid-keys.json (mode 0600), so the
 * browsers' subscriptions stay valid across restarts (new keys would orphan every one of them).
 */
export function loadOrCreateVapidKeys(dataDir: string): VapidKeys {
  const file = join(dataDir, VAPID_FILE);
  if (existsSync(file)) {
    const parsed = VapidFileSchema.safeParse(JSON.parse(readFileSync(file, 'utf8')));
    if (!parsed.success) throw new Error(`The VAPID key file ${file} is damaged: delete it to make new keys (every browser must then subscribe again)`);
    return parsed.data;
  }
  const keys = webpush.generateVAPIDKeys();
  mkdirSync(dataDir, { recursive: true });
  // Written beside and renamed, so a crash mid-write never leaves a half file.
  const partial = `${file}.${process.pid}.tmp`;
  writeFileSync(partial, JSON.stringify(keys, null, 2), { mode: 0o600 });
  renameSync(partial, file);
  return { publicKey: keys.publicKey, privateKey: keys.privateKey };
}
