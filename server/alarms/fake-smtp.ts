import type { AddressInfo } from 'node:net';
import { SMTPServer } from 'smtp-server';
import { decodeMail } from './mime-decode.js';
import type { Logger } from '../log/logger.js';

/** Largest message the fake server takes (alarm mail is a few kB). */
const MAX_MESSAGE_BYTES = 1_000_000;

/** One message as the fake server received it. */
export interface ReceivedMail {
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
  /** The message as sent, headers included (tests read headers from it). */
  raw: string;
  receivedAt: Date;
}

/** Options: where received mail goes besides the in-memory list, and the port (0 = any free). */
export interface FakeSmtpOptions {
  port?: number;
  onMail?: (mail: ReceivedMail) => Promise<void> | void;
  log?: Logger;
}

/**
 * A local SMTP server on loopback that keeps what it receives (demo, development, tests):
 * alarm mail can be read in the app without a real mail server. No TLS, no authentication;
 * it listens on 127.0.0.1 only.
 */
export class FakeSmtpServer {
  readonly received: ReceivedMail[] = [];
  private server: SMTPServer | null = null;
  private boundPort = 0;

  constructor(private readonly options: FakeSmtpOptions = {}) {}

  /** Starts listening (again, after stop(), on the same port); resolves with the port. */
  async start(port = this.boundPort || (this.options.port ?? 0)): Promise<number> {
    const server = new SMTPServer({
      authOptional: true,
      disabledCommands: ['STARTTLS', 'AUTH'],
      size: MAX_MESSAGE_BYTES,
      logger: false,
      onData: (stream, session, callback) => {
        const chunks: Buffer[] = [];
        stream.on('data', (c: Buffer) => chunks.push(c));
        stream.on('end', () => {
          const raw = Buffer.concat(chunks).toString('utf8');
          const decoded = decodeMail(raw);
          const mail: ReceivedMail = {
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
            to: session.envelope.rcptTo.map((r) => r.address),
            subject: decoded.subject, text: decoded.text, html: decoded.html, raw, receivedAt: new Date(),
          };
          this.received.push(mail);
          Promise.resolve(this.options.onMail?.(mail)).then(() => callback(), (err: unknown) => {
            this.options.log?.error('fake SMTP: could not keep a message', err);
            callback(err instanceof Error ? err : new Error(String(err)));
          });
        });
      },
    });
    await new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen(port, '127.0.0.1', () => {
        server.off('error', reject);
        resolve();
      });
    });
    server.on('error', (err) => this.options.log?.error('fake SMTP server error', err));
    this.server = server;
    this.boundPort = (server.server.address() as AddressInfo).port;
    return this.boundPort;
  }

  /** The port it listens (or last listened) on. */
  get port(): number {
    return this.boundPort;
  }

  /** The smtp:// URL to send to. */
  get url(): string {
    return `smtp://127.0.0.1:${this.boundPort}`;
  }

  /** Stops listening and drops open connections. */
  async stop(): Promise<void> {
    const server = this.server;
    this.server = null;
    if (!server) return;
    await new Promise<void>((resolve) => server.close(() => resolve()));
  }
}
