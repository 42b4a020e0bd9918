import { randomBytes } from 'node:crypto';
import { mkdirSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
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
  if (existsSync(file)) {
    const parsed = SecretsFileSchema.safeParse(JSON.parse(readFileSync(file, 'utf8')));
    if (parsed.success) return parsed.data;
    throw new Error(`${file} is damaged: delete it to generate new secrets (sessions will end)`);
  }
  const secrets: StoredSecrets = {
    sessionSecret: randomBytes(SECRET_BYTES).toString('base64url'),
    dbPassword: randomBytes(SECRET_BYTES).toString('base64url'),
  };
  mkdirSync(dataDir, { recursive: true });
  writeFileSync(file, JSON.stringify(secrets, null, 2), { mode: 0o600 });
  return secrets;
}
