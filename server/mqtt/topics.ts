/**
 * The MQTT topics of bench gateways, in one place (the broker's ACLs are written from the
 * same functions, so a gateway's rights and the topics it uses cannot drift apart).
 *
 *   kneepoint/bench/<benchId>/feed        gateway → server: frames and status, in order (QoS 1)
 *   kneepoint/gateway/<name>/state        gateway → server: online state, retained; last will
 *   kneepoint/gateway/<name>/config       server → gateway: the benches to run, retained
 */
export const TOPIC_ROOT = 'kneepoint';

/** A bench's feed topic. */
export const benchFeedTopic = (benchId: number): string => `${TOPIC_ROOT}/bench/${benchId}/feed`;
/** A gateway's state topic (its will goes here too). */
export const gatewayStateTopic = (name: string): string => `${TOPIC_ROOT}/gateway/${name}/state`;
/** A gateway's configuration topic. */
export const gatewayConfigTopic = (name: string): string => `${TOPIC_ROOT}/gateway/${name}/config`;

/** What the server subscribes to. */
export const SERVER_SUBSCRIPTIONS = [`${TOPIC_ROOT}/bench/+/feed`, `${TOPIC_ROOT}/gateway/+/state`];

/** The MQTT user name of a gateway. */
export const gatewayUsername = (name: string): string => `gateway-${name}`;
/** The server's own MQTT user name on a broker the project configures. */
export const SERVER_USERNAME = 'kneepoint-server';

/** Reads a topic the server subscribes to; null for anything else. */
export function parseTopic(topic: string): { kind: 'feed'; benchId: number } | { kind: 'state'; gateway: string } | null {
  const parts = topic.split('/');
  if (parts.length !== 4 || parts[0] !== TOPIC_ROOT) return null;
  if (parts[1] === 'bench' && parts[3] === 'feed' && /^[1-9]\d{0,9}$/.test(parts[2]!)) return { kind: 'feed', benchId: Number(parts[2]) };
  if (parts[1] === 'gateway' && parts[3] === 'state' && parts[2]) return { kind: 'state', gateway: parts[2] };
  return null;
}
