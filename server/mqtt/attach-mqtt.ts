import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import type { Server } from 'node:http';
import { join } from 'node:path';
import type { AppContext } from '../app-context.js';
import { systemClock } from '../ingest/clock.js';
import { hashBrokerPassword } from './broker/broker-files.js';
import { MosquittoBroker } from './broker/mosquitto-broker.js';
import { GatewayLink } from './gateway-link.js';
import { sqlFeedSeqStore } from './feed-seq-store.js';
import { createGatewayService, type GatewayService } from './gateway-service.js';
import { SERVER_USERNAME } from './topics.js';
import { createLogger } from '../log/logger.js';

declare module '../app-context.js' {
  interface AppServices {
    /** The server's MQTT link to bench gateways; set by the MQTT attachment when MQTT is configured. */
    gatewayLink: GatewayLink;
    /** Registering, revoking and assigning gateways. */
    gateways: GatewayService;
  }
}

/** Options of the MQTT attachment; tests pass a broker they started themselves. */
export interface MqttAttachmentOptions {
  /** A running broker this server configures (tests); default: from the configuration. */
  broker?: MosquittoBroker;
}

const SERVER_PASSWORD_BYTES = 24;

/** The server's password on a broker the project configures, made once and kept in the data folder (mode 600). */
function serverPassword(dir: string): string {
  const file = join(dir, 'server-password');
  if (existsSync(file)) return readFileSync(file, 'utf8').trim();
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  const password = randomBytes(SERVER_PASSWORD_BYTES).toString('base64url');
  writeFileSync(file, password, { mode: 0o600 });
  return password;
}

/**
 * Server attachment for bench gateways; without MQTT configured it does nothing. With
 * `KNEEPOINT_MQTT=local` it writes the broker's files and starts a private Mosquitto on
 * loopback; with `KNEEPOINT_MQTT_URL` it connects there and keeps the password and ACL files
 * for that broker in `<data dir>/mosquitto/`. Runs before the bench manager, which makes
 * gateway benches' stand-in sources through the link.
 */
export function mqttAttachment(options: MqttAttachmentOptions = {}) {
  return async function attachMqtt(httpServer: Server, ctx: AppContext): Promise<(() => Promise<void>) | void> {
    const config = ctx.config.mqtt;
    if (!config && !options.broker) return;
    const log = createLogger('mqtt', ctx.log);
    const dir = join(ctx.config.dataDir, 'mosquitto');
    const ownBroker = !options.broker && config?.local === true;
    const broker = options.broker ?? new MosquittoBroker(dir, config?.localPort ?? 0, log);
    // A broker the project runs gets the server's own generated account; an outside one is reached with the URL's.
    const external = !options.broker && !config?.local && config?.url ? new URL(config.url) : null;
    const username = external ? decodeURIComponent(external.username) || SERVER_USERNAME : SERVER_USERNAME;
    const password = external ? decodeURIComponent(external.password) : serverPassword(broker.dir);
    const serverAccount = { username, passwordHash: await hashBrokerPassword(broker.binaries.passwd, username, password) };
    const holder: { link?: GatewayLink } = {};
    const service = createGatewayService({
      sequelize: ctx.sequelize,
      broker,
      serverAccount,
      link: () => holder.link,
      manager: () => ctx.services.benchManager,
    });
    await service.syncAccess();
    if (ownBroker) await broker.start();
    const url = external ? `${external.protocol}//${external.host}` : broker.url;
    const link = new GatewayLink({ url, username, password, clock: systemClock, log, loadGateways: service.known, configFor: service.configFor, seqStore: sqlFeedSeqStore(ctx.sequelize) });
    holder.link = link;
    await link.prepare();
    ctx.services.gatewayLink = link;
    ctx.services.gateways = service;
    // Connect once the server listens: every attachment (benches' stand-ins, the recorder and its resumed
    // runs) is in place by then, so what the broker queued while the server was away is recorded, not dropped.
    httpServer.once('listening', () => {
      void link.connect().then(() => log.info(`gateways over ${url}${link.connected ? '' : ' (broker not reached yet; retrying)'}`));
    });
    return async () => {
      await link.stop();
      delete ctx.services.gatewayLink;
      delete ctx.services.gateways;
      if (ownBroker) await broker.stop();
    };
  };
}
