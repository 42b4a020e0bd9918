import { execFile } from 'node:child_process';
import { mkdtemp, rename, rm, writeFile, readFile } from 'node:fs/promises';
import { join } from 'node:path';
import { benchFeedTopic, gatewayConfigTopic, gatewayStateTopic, SERVER_USERNAME, TOPIC_ROOT } from '../topics.js';

/** One account on the broker: a user name and its password hash in mosquitto_passwd's format. */
export interface BrokerAccount {
  username: string;
  passwordHash: string;
}

/** A gateway's rights: its own state and config topics and the feed topics of its benches only. */
export interface GatewayGrant {
  name: string;
  username: string;
  benchIds: number[];
}

/**
 * Hashes a password with Debian's mosquitto_passwd (salted PBKDF2-SHA512 in 2.0). The
 * password goes through a private temporary file (`-U` converts it in place), never the
 * command line, where other users could read it in the process list.
 */
export async function hashBrokerPassword(passwdPath: string, username: string, password: string): Promise<string> {
  if (/[:\n\r]/.test(username) || /[\n\r]/.test(password)) throw new Error('broker user names hold no colon or line break; passwords no line break');
  const dir = await mkdtemp(join(process.env.TMPDIR ?? '/tmp', 'kp-mqtt-'));
  const file = join(dir, 'passwd');
  try {
    await writeFile(file, `${username}:${password}\n`, { mode: 0o600 });
    await new Promise<void>((resolve, reject) =>
      execFile(passwdPath, ['-U', file], (error, _out, stderr) => (error ? reject(new Error(`mosquitto_passwd failed: ${stderr || error.message}`)) : resolve())),
    );
    const line = (await readFile(file, 'utf8')).trim();
    const hash = line.slice(username.length + 1);
    if (!line.startsWith(`${username}:`) || !hash.startsWith('$')) throw new Error('mosquitto_passwd wrote no hash');
    return hash;
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

/** The password file's text: one `user:hash` line per account. */
export function passwordFileText(accounts: readonly BrokerAccount[]): string {
  return accounts.map((a) => `${a.username}:${a.passwordHash}\n`).join('');
}

/**
 * The ACL file's text. The server reads every feed and state topic and writes configs;
 * each gateway writes only its own benches' feeds and its own state, and reads its config.
 * Anything not granted is refused (Mosquitto denies by default once an ACL file is set).
 */
export function aclFileText(gateways: readonly GatewayGrant[], serverUsername = SERVER_USERNAME): string {
  const lines = [
    '# Written by Kneepoint; changes are overwritten when gateways or assignments change.',
    `user ${serverUsername}`,
    `topic read ${TOPIC_ROOT}/bench/+/feed`,
    `topic read ${TOPIC_ROOT}/gateway/+/state`,
    `topic write ${TOPIC_ROOT}/gateway/+/config`,
    '',
  ];
  for (const g of gateways) {
    lines.push(`user ${g.username}`, `topic write ${gatewayStateTopic(g.name)}`, `topic read ${gatewayConfigTopic(g.name)}`);
    for (const id of [...g.benchIds].sort((a, b) => a - b)) lines.push(`topic write ${benchFeedTopic(id)}`);
    lines.push('');
  }
  return lines.join('\n');
}

/** Where a broker's listener and files are. */
export interface BrokerConfigOptions {
  dir: string;
  port: number;
  host?: string;
}

/** Largest queue the broker keeps for an offline subscriber (the server): about 8 minutes of 200 benches at 10 Hz. */
export const MAX_QUEUED_MESSAGES = 1_000_000;
/** Seconds between the broker's saves of its queues to disk (it also saves on a clean stop). */
export const AUTOSAVE_INTERVAL_S = 5;

/** The broker's configuration file: loopback listener, no anonymous access, our password and ACL files, persistence. */
export function brokerConfigText(o: BrokerConfigOptions): string {
  return [
    '# Written by Kneepoint.',
    'per_listener_settings false',
    `listener ${o.port} ${o.host ?? '127.0.0.1'}`,
    'allow_anonymous false',
    `password_file ${join(o.dir, 'passwd')}`,
    `acl_file ${join(o.dir, 'acl')}`,
    'persistence true',
    `persistence_location ${join(o.dir, 'data')}/`,
    `autosave_interval ${AUTOSAVE_INTERVAL_S}`,
    `max_queued_messages ${MAX_QUEUED_MESSAGES}`,
    // Run as whoever started it (as root Mosquitto would otherwise switch to its own user, who cannot read these files).
    'user root',
    `log_dest file ${join(o.dir, 'mosquitto.log')}`,
    'log_type error',
    'log_type warning',
    'log_type notice',
    'connection_messages true',
    '',
  ].join('\n');
}

/** Writes a file by rename, so the broker never reads half of it on a reload. */
export async function writeAtomically(path: string, text: string): Promise<void> {
  const temporary = `${path}.${process.pid}.tmp`;
  await writeFile(temporary, text, { mode: 0o600 });
  await rename(temporary, path);
}
