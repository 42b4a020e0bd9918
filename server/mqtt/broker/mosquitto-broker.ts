import { spawn, type ChildProcess } from 'node:child_process';
import { mkdir } from 'node:fs/promises';
import { connect } from 'node:net';
import { join } from 'node:path';
import { aclFileText, brokerConfigText, passwordFileText, writeAtomically, type BrokerAccount, type GatewayGrant } from './broker-files.js';
import { ensureMosquittoBinaries, type MosquittoBinaries } from './mosquitto-binaries.js';
import { quietLogger, type Logger } from '../../log/logger.js';

const READY_TIMEOUT_MS = 10_000;
const READY_POLL_MS = 50;
const STOP_TIMEOUT_MS = 10_000;

/** Who may use the broker: the server's account, and each gateway's account and rights. */
export interface BrokerAccess {
  server: BrokerAccount;
  gateways: Array<GatewayGrant & { passwordHash: string }>;
}

function portAnswers(port: number, host: string): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = connect({ port, host });
    socket.once('connect', () => (socket.destroy(), resolve(true)));
    socket.once('error', () => resolve(false));
  });
}

/**
 * A private Mosquitto on loopback, configured by the project: its config, password and ACL
 * files live in `dir`; `setAccess` rewrites the last two and tells the running broker to
 * read them again (SIGHUP), so a new, revoked or reassigned gateway takes effect at once.
 */
export class MosquittoBroker {
  private child: ChildProcess | undefined;
  private exited: Promise<void> = Promise.resolve();
  readonly binaries: MosquittoBinaries;

  constructor(
    readonly dir: string,
    readonly port: number,
    private readonly log: Logger = quietLogger,
    readonly host = '127.0.0.1',
  ) {
    this.binaries = ensureMosquittoBinaries(log);
  }

  /** The URL clients connect to. */
  get url(): string {
    return `mqtt://${this.host}:${this.port}`;
  }

  /** The broker's process id while it runs. */
  get pid(): number | undefined {
    return this.child?.pid;
  }

  /** Whether the broker process is running. */
  get running(): boolean {
    return this.child !== undefined;
  }

  /** Writes the password and ACL files, and makes a running broker read them again. */
  async setAccess(access: BrokerAccess): Promise<void> {
    await mkdir(this.dir, { recursive: true, mode: 0o700 });
    await writeAtomically(join(this.dir, 'passwd'), passwordFileText([access.server, ...access.gateways]));
    await writeAtomically(join(this.dir, 'acl'), aclFileText(access.gateways, access.server.username));
    this.child?.kill('SIGHUP');
  }

  /** Starts the broker (the access files must have been written) and waits until it takes connections. */
  async start(): Promise<void> {
    if (this.child) return;
    await mkdir(join(this.dir, 'data'), { recursive: true, mode: 0o700 });
    const configPath = join(this.dir, 'mosquitto.conf');
    await writeAtomically(configPath, brokerConfigText({ dir: this.dir, port: this.port, host: this.host }));
    if (await portAnswers(this.port, this.host)) throw new Error(`Port ${this.port} on ${this.host} is already in use: the MQTT broker cannot listen there`);
    const child = spawn(this.binaries.mosquitto, ['-c', configPath], { stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr?.on('data', (chunk: Buffer) => void (stderr += chunk.toString()));
    this.child = child;
    this.exited = new Promise((resolve) =>
      child.once('exit', (code, signal) => {
        if (this.child === child) this.child = undefined;
        this.log.warn(`mosquitto stopped (${signal ?? `exit ${code}`})${stderr ? `: ${stderr.trim()}` : ''}`);
        resolve();
      }),
    );
    const until = Date.now() + READY_TIMEOUT_MS;
    while (!(await portAnswers(this.port, this.host))) {
      if (!this.child) throw new Error(`mosquitto did not start: ${stderr.trim() || 'see ' + join(this.dir, 'mosquitto.log')}`);
      if (Date.now() > until) throw new Error(`mosquitto did not listen on ${this.port} within ${READY_TIMEOUT_MS} ms`);
      await new Promise((r) => setTimeout(r, READY_POLL_MS));
    }
    this.log.info(`mosquitto listening on ${this.url}`);
  }

  /** Stops the broker cleanly (it saves its queues first); SIGKILL after a timeout. */
  async stop(): Promise<void> {
    const child = this.child;
    if (!child) return;
    child.kill('SIGTERM');
    const timer = setTimeout(() => child.kill('SIGKILL'), STOP_TIMEOUT_MS);
    await this.exited;
    clearTimeout(timer);
  }
}
