import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { hashBrokerPassword } from '../../server/mqtt/broker/broker-files.js';
import { MosquittoBroker } from '../../server/mqtt/broker/mosquitto-broker.js';

/** A TCP port nobody listens on now (the OS picks it). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as { port: number };
      server.close(() => resolve(port));
    });
  });
}

/** A fresh temporary folder. */
export const tempDir = (prefix: string) => mkdtempSync(join(tmpdir(), prefix));

/** Starts a private Mosquitto for one test file (the server's attachment then writes its real accounts and ACLs). */
export async function startTestBroker(): Promise<MosquittoBroker> {
  const broker = new MosquittoBroker(tempDir('kp-broker-'), await freePort());
  // A placeholder account until the server writes its own: the broker needs a password file to start.
  await broker.setAccess({ server: { username: 'nobody', passwordHash: await hashBrokerPassword(broker.binaries.passwd, 'nobody', 'not-used-0123') }, gateways: [] });
  await broker.start();
  return broker;
}

/** A gateway process (`npm run gateway`'s entry) and its output. */
export class GatewayProcess {
  output = '';
  private child: ChildProcess | undefined;
  private exited: Promise<void> = Promise.resolve();

  constructor(
    readonly brokerUrl: string,
    readonly name: string,
    readonly password: string,
    readonly dir: string,
  ) {}

  /** Starts it and waits until it says it runs. */
  async start(): Promise<void> {
    const child = spawn(process.execPath, ['--import', 'tsx', 'server/gateway/gateway-cli.ts', '--broker', this.brokerUrl, '--id', this.name, '--dir', this.dir], {
      env: { ...process.env, KNEEPOINT_GATEWAY_PASSWORD: this.password },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    this.child = child;
    child.stdout!.on('data', (d: Buffer) => void (this.output += d.toString()));
    child.stderr!.on('data', (d: Buffer) => void (this.output += d.toString()));
    this.exited = new Promise((resolve) => child.once('exit', () => resolve()));
    const until = Date.now() + 20_000;
    while (!this.output.includes('running')) {
      if (child.exitCode !== null) throw new Error(`gateway exited: ${this.output}`);
      if (Date.now() > until) throw new Error(`gateway did not start: ${this.output}`);
      await new Promise((r) => setTimeout(r, 50));
    }
  }

  /** Stops it: SIGTERM (clean) or SIGKILL (a crash, a pulled plug). */
  async stop(signal: 'SIGTERM' | 'SIGKILL' = 'SIGTERM'): Promise<void> {
    if (!this.child || this.child.exitCode !== null) return;
    this.child.kill(signal);
    await this.exited;
  }
}
