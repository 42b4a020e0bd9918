import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { z } from 'zod';

const SECRET_BYTES = 32;
const SecretsFileSchema = z.object({ sessionSecret: z.string().min(32), dbPassword: z.string().min(12) });
export type StoredSecrets = z.infer<typeof SecretsFileSchema>;

/**
 * Secrets generated on first start and kept in DATA_DIR/secrets.json (mode 0600), so that a
 * demo or development install needs no configuration yet sessions survive restarts.
 */
export function loadOrCreateSecrets(dataDir: string): StoredSecrets {
  const file = join(dataDir, 'secrets.json');
  if (existsSync(file)) return readSecrets(file);
  const secrets: StoredSecrets = {
    sessionSecret: randomBytes(SECRET_BYTES).toString('base64url'),
    dbPassword: randomBytes(SECRET_BYTES).toString('base64url'),
  };
  mkdirSync(dataDir, { recursive: true });
  // Written beside and renamed, so a crash mid-write never leaves a half file to trip on.
  const partial = `${file}.${process.pid}.tmp`;
  writeFileSync(partial, JSON.stringify(secrets, null, 2), { mode: 0o600 });
  renameSync(partial, file);
  return secrets;
}

/** Reads a secrets file; any fault (unreadable, empty, not JSON, wrong shape) names the file. */
function readSecrets(file: string): StoredSecrets {
  const damaged = (why: string) =>
    new Error(`The secrets file ${file} ${why}: delete it to generate new secrets (signed-in users will have to sign in again)`);
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (error) {
    throw damaged(`cannot be read (${error instanceof Error ? error.message : String(error)})`);
  }
  if (text.trim() === '') throw damaged('is empty');
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    throw damaged('is not valid JSON');
  }
  const parsed = SecretsFileSchema.safeParse(json);
  if (!parsed.success) throw damaged(`is damaged (${parsed.error.issues.map((i) => i.path.join('.') || 'file').join(', ')})`);
  return parsed.data;
}
