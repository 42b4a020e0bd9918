import { execFileSync } from 'node:child_process';
import { createECDH, randomBytes } from 'node:crypto';
import { mkdtempSync, readFileSync } from 'node:fs';
import type { IncomingHttpHeaders } from 'node:http';
import { createServer, type Server } from 'node:https';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
// @ts-expect-error -- http_ece ships no types; decrypt(buffer, params) is its documented API.
import ece from 'http_ece';
import { PushPayloadSchema, type PushPayload } from '../../shared/schemas/push.js';

/** A self-signed certificate for 127.0.0.1 (web-push speaks only https), made with the openssl command. */
export function loopbackCertificate(): { key: Buffer; cert: Buffer } {
  const dir = mkdtempSync(join(tmpdir(), 'kp-push-tls-'));
  execFileSync('openssl', ['req', '-x509', '-newkey', 'ec', '-pkeyopt', 'ec_paramgen_curve:prime256v1', '-nodes', '-days', '1',
    '-subj', '/CN=127.0.0.1', '-addext', 'subjectAltName=IP:127.0.0.1', '-keyout', join(dir, 'key.pem'), '-out', join(dir, 'cert.pem')], { stdio: 'ignore' });
  return { key: readFileSync(join(dir, 'key.pem')), cert: readFileSync(join(dir, 'cert.pem')) };
}

/** One POST the fake push service received, with the status it answered. */
export interface PushRequest {
  path: string;
  headers: IncomingHttpHeaders;
  body: Buffer;
  status: number;
  atMs: number;
}

/**
 * A push service on loopback (https): answers 201 to every POST (RFC 8030 §5), 410 under
 * /gone/, or what `statusFor` says (a test takes one browser's service down with 503).
 */
export class FakePushService {
  readonly received: PushRequest[] = [];
  statusFor: (path: string) => number = (path) => (path.startsWith('/gone/') ? 410 : 201);
  private server: Server;
  url = '';

  constructor(tls: { key: Buffer; cert: Buffer }) {
    this.server = createServer(tls, (req, res) => {
      const chunks: Buffer[] = [];
      req.on('data', (c: Buffer) => chunks.push(c));
      req.on('end', () => {
        const status = this.statusFor(req.url ?? '');
        this.received.push({ path: req.url ?? '', headers: req.headers, body: Buffer.concat(chunks), status, atMs: Date.now() });
        res.writeHead(status).end();
      });
    });
  }

  /** Starts listening on a free loopback port. */
  async start(): Promise<void> {
    await new Promise<void>((r) => this.server.listen(0, '127.0.0.1', r));
    this.url = `https://127.0.0.1:${(this.server.address() as AddressInfo).port}`;
  }

  /** Stops listening. */
  stop(): Promise<void> {
    return new Promise((r) => this.server.close(() => r()));
  }
}

/** A browser's side of a subscription: its P-256 key pair and auth secret (RFC 8291 §3). */
export function browserKeys() {
  const ecdh = createECDH('prime256v1');
  ecdh.generateKeys();
  const auth = randomBytes(16);
  return { ecdh, auth, json: { p256dh: ecdh.getPublicKey().toString('base64url'), auth: auth.toString('base64url') } };
}

/** Decrypts an aes128gcm push body (RFC 8188) the way a browser would, with http_ece. */
export function decrypt(body: Buffer, keys: ReturnType<typeof browserKeys>): PushPayload {
  const plain = ece.decrypt(body, { version: 'aes128gcm', privateKey: keys.ecdh, authSecret: keys.auth }) as Buffer;
  return PushPayloadSchema.parse(JSON.parse(plain.toString('utf8')));
}
