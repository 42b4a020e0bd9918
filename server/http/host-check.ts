import type { IncomingMessage } from 'node:http';
import type { RequestHandler } from 'express';
import proxyAddr from 'proxy-addr';
import { splitHost, type TrustProxySetting } from '../config/proxy-settings.js';

/** Names a loopback install is reached by; always accepted. */
const LOOPBACK_NAMES = new Set(['localhost', '[::1]']);
const LOOPBACK_V4 = /^127\.\d{1,3}\.\d{1,3}\.\d{1,3}$/;

/**
 * True when a Host header names this server: a loopback name on any port, or one of the
 * configured public names (an entry with a port matches only that port). Checking it stops
 * DNS rebinding, where a page on another site points its own name at 127.0.0.1.
 */
export function isAllowedHost(host: string | undefined, allowedHosts: readonly string[]): boolean {
  if (!host) return false;
  const { name, port } = splitHost(host);
  if (LOOPBACK_NAMES.has(name) || LOOPBACK_V4.test(name)) return true;
  return allowedHosts.some((entry) => {
    const allowed = splitHost(entry);
    return allowed.name === name && (allowed.port === undefined || allowed.port === port);
  });
}

/** Refuses (400) any request whose Host header is not one of this server's names. */
export function hostCheck(allowedHosts: readonly string[]): RequestHandler {
  return (req, res, next) => {
    if (isAllowedHost(req.headers.host, allowedHosts)) return next();
    res.status(400).json({ error: { message: 'This server does not answer to that host name (its administrator can add it to KNEEPOINT_ALLOWED_HOSTS)' } });
  };
}

/**
 * The scheme a raw request (a WebSocket upgrade) arrived with, as Express's req.protocol
 * would say: https on a TLS socket, else the first X-Forwarded-Proto when the peer is a
 * trusted proxy, else http.
 */
export function requestScheme(req: IncomingMessage, trustProxy: TrustProxySetting): 'http' | 'https' {
  if ((req.socket as { encrypted?: boolean }).encrypted) return 'https';
  const forwarded = req.headers['x-forwarded-proto'];
  if (trustProxy === false || typeof forwarded !== 'string') return 'http';
  const trust = typeof trustProxy === 'number' ? (_addr: string, i: number) => i < trustProxy : proxyAddr.compile(trustProxy);
  if (!trust(req.socket.remoteAddress ?? '', 0)) return 'http';
  return forwarded.split(',')[0]!.trim().toLowerCase() === 'https' ? 'https' : 'http';
}
