import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Express } from 'express';
import { loadConfig, type AppConfig, type DatabaseConfig } from './config/config.js';
import { provisionMariaDb, type ProvisionedMariaDb } from './db/provisioner.js';
import { isPortFree } from './db/mariadb-process.js';
import { createSequelize } from './db/sequelize.js';
import { migrate } from './db/migrate.js';
import { seedDemo, seedDemoLabHistory } from './db/seed-demo.js';
import { demoInstrumentLinkDir } from './benches/seed-demo-benches.js';
import { consoleLogger, createAppContext, type AppContext, type Logger } from './app-context.js';
import { redactingLogger } from './http/redact-tokens.js';
import { createApp } from './app.js';
import { DatabaseHealth } from './db/database-health.js';
import { createPingProbe } from './db/database-probe.js';
import { watchDatabase, type DatabaseWatch } from './db/database-watch.js';
import { guardQueries } from './db/query-guard.js';
import { attachBenchManager } from './compose/bench-root.js';
import { attachRecording } from './compose/recording-root.js';
import { backupAttachment } from './backup/attach-backups.js';
import { attachAlarms } from './compose/alarms-root.js';
import { attachPush } from './push/attach-push.js';
import { attachProgrammes } from './programmes/attach-programmes.js';
import { attachInstruments } from './instruments/attach-instruments.js';
import { mqttAttachment } from './mqtt/attach-mqtt.js';
import { createLogger } from './log/logger.js';

/** Undoes an attachment (close sockets, stop timers); awaited on server close. */
export type Detach = () => Promise<void> | void;
/** Runs just before the HTTP server listens: attach a WebSocket server, start bench managers, … */
export type Attachment = (httpServer: Server, ctx: AppContext) => Promise<Detach | void> | Detach | void;

/**
 * What runs before listen, in this order (detached in reverse on close): the MQTT link; the
 * bench manager and the recording (composition roots in server/compose); instruments; the
 * alarms (server/compose), before programmes so that a programme stranded by a stop raises
 * its alarm at start; programmes, Web Push and scheduled backups.
 */
// Alarms before programmes: a programme stranded by the last stop fails at start-up, and its alarm must be raised.
export const ATTACHMENTS: Attachment[] = [mqttAttachment(), attachBenchManager, attachRecording, attachInstruments, attachAlarms, attachProgrammes, attachPush, backupAttachment()];

/** How to start; everything is optional (defaults: environment config, provisioned MariaDB). */
export interface StartServerOptions {
  config?: AppConfig;
  /** Use this database as is (tests); the provisioner is skipped. */
  database?: DatabaseConfig;
  /** Override config.port (0 = any free port) or config.host. */
  port?: number;
  host?: string;
  /** Apply pending migrations first (default true). */
  migrate?: boolean;
  /** Seed the demo lab when the database has no users (default false). */
  seedDemo?: boolean;
  /** With seedDemo on a fresh database: also import the demo lab's past runs (default true). */
  demoHistory?: boolean;
  /** Default: ATTACHMENTS. */
  attachments?: Attachment[];
  log?: Logger;
}

/** A listening Kneepoint server. close() detaches, stops HTTP, closes the pool, stops MariaDB if we started it. */
export interface RunningServer {
  url: string;
  port: number;
  httpServer: Server;
  app: Express;
  ctx: AppContext;
  mariadb?: ProvisionedMariaDb;
  demoSeeded: boolean;
  close(): Promise<void>;
}

async function openDatabase(config: AppConfig, options: StartServerOptions, log: Logger) {
  if (options.database) return { database: options.database, mariadb: undefined };
  if (!config.db.provision) return { database: config.db, mariadb: undefined };
  const mariadb = await provisionMariaDb({
    baseDir: config.db.mariadbDir, port: config.db.port, database: config.db.database,
    user: config.db.user, password: config.db.password, log: createLogger('mariadb', log),
  });
  return { database: mariadb as DatabaseConfig, mariadb };
}

function portInUse(port: number, host: string): Error {
  return new Error(`Port ${port} on ${host} is already in use: stop the other program or set KNEEPOINT_PORT`);
}

function listen(httpServer: Server, port: number, host: string): Promise<number> {
  return new Promise((resolve, reject) => {
    const onError = (error: NodeJS.ErrnoException) => reject(error.code === 'EADDRINUSE' ? portInUse(port, host) : error);
    httpServer.once('error', onError);
    httpServer.listen(port, host, () => {
      httpServer.off('error', onError);
      resolve((httpServer.address() as AddressInfo).port);
    });
  });
}

/** Provisions (unless given a database), migrates, optionally seeds, listens on loopback, runs attachments. */
export async function startServer(options: StartServerOptions = {}): Promise<RunningServer> {
  const log = redactingLogger(options.log ?? consoleLogger);
  const config = options.config ?? loadConfig();
  const host = options.host ?? config.host;
  const wantedPort = options.port ?? config.port;
  // Check the HTTP port before starting MariaDB, so a taken port fails at once.
  if (wantedPort !== 0 && !(await isPortFree(wantedPort, host))) throw portInUse(wantedPort, host);
  const { database, mariadb } = await openDatabase(config, options, log);
  const sequelize = createSequelize(database);
  const detaches: Detach[] = [];
  let httpServer: Server | undefined;
  let ctx: AppContext | undefined;
  let watch: DatabaseWatch | undefined;
  const close = async () => {
    // Stop supervising first, so a MariaDB being stopped on purpose is not started again.
    await watch?.stop();
    for (const detach of detaches.splice(0).reverse()) await detach();
    if (httpServer?.listening) {
      httpServer.closeAllConnections();
      await new Promise<void>((resolve) => httpServer!.close(() => resolve()));
    }
    await ctx?.runCloseHandlers();
    await sequelize.close();
    await mariadb?.stop();
  };
  try {
    await sequelize.authenticate();
    if (options.migrate ?? true) await migrate(sequelize);
    ctx = createAppContext(config, sequelize, log);
    // Watch the database (and restart it when we provisioned it): queries fail fast while it is away.
    const health = new DatabaseHealth(mariadb !== undefined);
    ctx.services.databaseHealth = health;
    guardQueries(sequelize, health);
    watch = watchDatabase({ health, probe: createPingProbe(database), server: mariadb, log: createLogger('mariadb', log) });
    const demoSeeded = options.seedDemo ? (await seedDemo(ctx.models, config.demoPassword, { instrumentLinkDir: demoInstrumentLinkDir(config.dataDir) })).seeded : false;
    if (demoSeeded && (options.demoHistory ?? true)) await seedDemoLabHistory(ctx);
    const app = createApp(ctx);
    httpServer = createServer(app);
    // Attachments first, then listen: no request is answered before live runs have resumed
    // (and replayed their journal), so nobody is ever shown a run's totals from before that.
    for (const attach of options.attachments ?? ATTACHMENTS) {
      const detach = await attach(httpServer, ctx);
      if (detach) detaches.push(detach);
    }
    const port = await listen(httpServer, wantedPort, host);
    const urlHost = host.includes(':') ? `[${host}]` : host;
    return { url: `http://${urlHost}:${port}`, port, httpServer, app, ctx, mariadb, demoSeeded, close };
  } catch (error) {
    await close().catch((closeError) => log.error('Cleanup after a failed start failed', closeError));
    throw error;
  }
}
