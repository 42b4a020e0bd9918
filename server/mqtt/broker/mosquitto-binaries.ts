import type { Logger } from '../../log/logger.js';
import { ensureDebianPrograms } from '../../system/debian-programs.js';

/** The exact command that installs the broker and its command-line clients on Debian. */
export const MOSQUITTO_INSTALL_COMMAND =
  'apt-get update && apt-get install -y --no-install-recommends mosquitto mosquitto-clients';

/** Paths of the Mosquitto programs the project runs. */
export interface MosquittoBinaries {
  mosquitto: string;
  passwd: string;
}

/**
 * Finds Mosquitto; when missing and we are root on Debian, installs it with apt-get (saying
 * so), as the provisioner does for MariaDB; otherwise stops with the exact command to run.
 */
export function ensureMosquittoBinaries(log: Logger, allowInstall = true): MosquittoBinaries {
  return ensureDebianPrograms({
    programs: { mosquitto: 'mosquitto', passwd: 'mosquitto_passwd' },
    product: 'Mosquitto',
    notFound: 'The MQTT broker (mosquitto, mosquitto_passwd) was not found.',
    installHint: 'Install it as root with',
    installCommand: MOSQUITTO_INSTALL_COMMAND,
  }, log, allowInstall);
}
