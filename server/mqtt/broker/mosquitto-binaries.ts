import { accessSync, constants, existsSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import { delimiter, join } from 'node:path';
import type { Logger } from '../../log/logger.js';

/** The exact command that installs the broker and its command-line clients on Debian. */
export const MOSQUITTO_INSTALL_COMMAND =
  'apt-get update && apt-get install -y --no-install-recommends mosquitto mosquitto-clients';

const EXTRA_BIN_DIRS = ['/usr/sbin', '/usr/bin', '/usr/local/sbin', '/usr/local/bin'];

/** Paths of the Mosquitto programs the project runs. */
export interface MosquittoBinaries {
  mosquitto: string;
  passwd: string;
}

function which(name: string): string | undefined {
  // mosquitto lives in /usr/sbin, which is not on an ordinary user's PATH.
  for (const dir of [...(process.env.PATH ?? '').split(delimiter), ...EXTRA_BIN_DIRS]) {
    const candidate = join(dir, name);
    try {
      accessSync(candidate, constants.X_OK);
      return candidate;
    } catch {
      // not here; try the next directory
    }
  }
  return undefined;
}

function find(): MosquittoBinaries | undefined {
  const mosquitto = which('mosquitto');
  const passwd = which('mosquitto_passwd');
  return mosquitto && passwd ? { mosquitto, passwd } : undefined;
}

/**
 * Finds Mosquitto; when missing and we are root on Debian, installs it with apt-get (saying
 * so), as the provisioner does for MariaDB; otherwise stops with the exact command to run.
 */
export function ensureMosquittoBinaries(log: Logger, allowInstall = true): MosquittoBinaries {
  const found = find();
  if (found) return found;
  if (!allowInstall || process.getuid?.() !== 0 || !existsSync('/etc/debian_version')) {
    throw new Error(`The MQTT broker (mosquitto, mosquitto_passwd) was not found.\nInstall it as root with:\n  ${MOSQUITTO_INSTALL_COMMAND}`);
  }
  log.warn(`Mosquitto is not installed: installing it now with\n  ${MOSQUITTO_INSTALL_COMMAND}`);
  execFileSync('sh', ['-c', MOSQUITTO_INSTALL_COMMAND], { stdio: 'inherit', env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } });
  const installed = find();
  if (!installed) throw new Error(`Mosquitto still missing after: ${MOSQUITTO_INSTALL_COMMAND}`);
  return installed;
}
