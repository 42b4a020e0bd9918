import { isIP } from 'node:net';
import { z } from 'zod';

/** Most reverse proxies a request can pass through that a hop count may name. */
const MAX_PROXY_HOPS = 10;
const MAX_IPV6_PREFIX = 128;
/** Address ranges Express's `trust proxy` knows by name. */
const NAMED_RANGES = ['loopback', 'linklocal', 'uniquelocal'];

/** What Express's `trust proxy` gets: off, a hop count, or the proxies' addresses and ranges. */
export type TrustProxySetting = false | number | string[];

const isAddressOrRange = (entry: string): boolean => {
  if (NAMED_RANGES.includes(entry)) return true;
  const [address, prefix, extra] = entry.split('/');
  if (extra !== undefined || !address || isIP(address) === 0) return false;
  return prefix === undefined || (/^\d{1,3}$/.test(prefix) && Number(prefix) <= MAX_IPV6_PREFIX);
};

/**
 * KNEEPOINT_TRUST_PROXY: whose X-Forwarded-For and X-Forwarded-Proto to believe. `false`
 * (default) believes nobody; a number 1–10 believes that many proxies in front; otherwise a
 * comma list of proxy addresses, CIDR ranges or loopback/linklocal/uniquelocal. `true` is
 * refused: it would believe any client's forwarded address and defeat the sign-in limits.
 */
export const TrustProxySchema = z
  .string()
  .default('false')
  .transform((value, ctx): TrustProxySetting => {
    const text = value.trim();
    if (text === 'false' || text === '0') return false;
    if (/^\d+$/.test(text)) {
      const hops = Number(text);
      if (hops <= MAX_PROXY_HOPS) return hops;
    } else if (text !== 'true' && text !== '') {
      const entries = text.split(',').map((e) => e.trim());
      if (entries.every(isAddressOrRange)) return entries;
    }
    ctx.addIssue({
      code: 'custom',
      message: `must be false, the number of proxies in front (1 to ${MAX_PROXY_HOPS}), or their addresses (e.g. loopback or 10.0.0.5,10.0.1.0/24); "true" is refused because it believes any client's forwarded address`,
    });
    return z.NEVER;
  });

const HOST_NAME = /^(?:[a-z0-9](?:[a-z0-9-]{0,61}[a-z0-9])?)(?:\.[a-z0-9](?:[a-z0-9-]{0,61}[a-z0-9])?)*$/;
const BRACKETED_IPV6 = /^\[([0-9a-f:.]+)\]$/;
const MAX_TCP_PORT = 65535;

/** A `name` or `name:port` the server may be reached by; names in lower case. */
export function isHostEntry(entry: string): boolean {
  const { name, port } = splitHost(entry);
  if (port !== undefined && !(/^[1-9]\d{0,4}$/.test(port) && Number(port) <= MAX_TCP_PORT)) return false;
  const v6 = BRACKETED_IPV6.exec(name);
  return v6 ? isIP(v6[1]!) === 6 : HOST_NAME.test(name);
}

/** Splits a Host header value into its name (lower case, no trailing dot) and port. */
export function splitHost(host: string): { name: string; port: string | undefined } {
  const lower = host.trim().toLowerCase();
  const close = lower.startsWith('[') ? lower.indexOf(']') : -1;
  const colon = close >= 0 ? lower.indexOf(':', close) : lower.lastIndexOf(':');
  const name = colon >= 0 ? lower.slice(0, colon) : lower;
  return { name: name.endsWith('.') ? name.slice(0, -1) : name, port: colon >= 0 ? lower.slice(colon + 1) : undefined };
}

/**
 * KNEEPOINT_ALLOWED_HOSTS: the public names the server answers to besides the loopback ones
 * (a comma list of `name` or `name:port`, e.g. `lab.example.org`); empty by default.
 */
export const AllowedHostsSchema = z
  .string()
  .default('')
  .transform((value, ctx) => {
    const entries = value.split(',').map((e) => e.trim().toLowerCase()).filter((e) => e !== '');
    const bad = entries.filter((e) => !isHostEntry(e));
    if (bad.length === 0) return entries;
    ctx.addIssue({ code: 'custom', message: `not a host name or name:port: ${bad.join(', ')}` });
    return z.NEVER;
  });
