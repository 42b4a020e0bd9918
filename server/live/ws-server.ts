import { randomBytes } from 'node:crypto';
import type { IncomingMessage, Server } from 'node:http';
import type { Duplex } from 'node:stream';
import { WebSocketServer, type WebSocket } from 'ws';
import { ClientMessageSchema, MAX_CLIENT_MESSAGE_BYTES } from '../../shared/schemas/ws.js';
import type { SessionUser } from '../auth/session-user.js';
import { CLIENT_BUDGET_BYTES } from './backpressure-policy.js';
import { ClientSender } from './client-sender.js';
import { isConnectionFailure } from '../db/connection-errors.js';
import { CLIENT_MESSAGES_PER_S, MessageRate } from './message-rate.js';
import type { LiveHub } from './live-hub.js';
import { quietLogger, type Logger } from '../log/logger.js';

export const WS_PATH = '/ws';
/** A socket that has not answered the previous ping by the next one is terminated. */
export const HEARTBEAT_MS = 15_000;
/** Close code for a socket whose session was ended (policy violation, RFC 6455 §7.4.1). */
export const SESSION_ENDED_CODE = 1008;
/**
 * Close code for a client that stayed over its byte budget (it does not read what it is
 * sent); from the range RFC 6455 §7.4.2 leaves to applications.
 */
export const CLIENT_TOO_SLOW_CODE = 4008;
/** Close code for a client that sends more messages than CLIENT_MESSAGES_PER_S allows (a flood). */
export const CLIENT_FLOOD_CODE = 4029;
/** How often every client's backlog is compared with its budget, even when nothing new is sent. */
export const BUDGET_CHECK_MS = 1_000;
/**
 * A client closed for its backlog that does not finish the close handshake is cut off after
 * this: long enough for a slow reader to drain up to its hard limit and read the close code,
 * while nothing more is queued for it meanwhile.
 */
export const CLOSE_HANDSHAKE_MS = 10_000;
const PING_NONCE_BYTES = 8;

export interface WsServerOptions {
  hub: LiveHub;
  /** Resolves the signed-in user of an upgrade request, or null (refused with 401). */
  authenticate: (req: IncomingMessage) => Promise<SessionUser | null>;
  /** Refuses cross-site upgrades (403); default: allow. */
  checkOrigin?: (req: IncomingMessage) => boolean;
  heartbeatMs?: number;
  /** How often backlogs are checked against the budget (default BUDGET_CHECK_MS). */
  budgetCheckMs?: number;
  /** Failures (error) and notable but expected events (warn: a client closed for its backlog). */
  log?: Logger;
}

function refuse(socket: Duplex, status: number, reason: string): void {
  socket.write(`HTTP/1.1 ${status} ${reason}\r\nConnection: close\r\nContent-Length: 0\r\n\r\n`);
  socket.destroy();
}

/**
 * The WebSocket endpoint on the HTTP server's own port: checks the session on upgrade,
 * greets with hello, hands validated subscribe/unsubscribe messages to the hub, answers
 * pings, and terminates sockets that stop answering heartbeats.
 */
export function attachWsServer(
  httpServer: Server,
  opts: WsServerOptions,
): { close(): Promise<void>; clients(): number; closeUser(userId: number, keepSid?: string): void; closeSession(sid: string): void } {
  const wss = new WebSocketServer({ noServer: true, maxPayload: MAX_CLIENT_MESSAGE_BYTES });
  // The payload of the ping each socket must answer; null once answered. Only a pong carrying
  // it counts, so unsolicited pongs from a client that reads nothing cannot keep it alive.
  const awaitedPong = new WeakMap<WebSocket, Buffer | null>();
  const senders = new Map<WebSocket, ClientSender>();
  // Who opened each socket with which session, so ending a user's sessions closes their sockets too.
  const owners = new WeakMap<WebSocket, { userId: number; sid: string | undefined }>();
  const log = opts.log ?? quietLogger;

  const onUpgrade = (req: IncomingMessage, socket: Duplex, head: Buffer) => {
    const path = (req.url ?? '').split('?')[0];
    if (path !== WS_PATH) {
      // Another attachment may own this path; if none does, answer rather than leave the socket open forever.
      if (httpServer.listenerCount('upgrade') === 1) refuse(socket, 404, 'Not Found');
      return;
    }
    if (opts.checkOrigin && !opts.checkOrigin(req)) return refuse(socket, 403, 'Forbidden');
    opts
      .authenticate(req)
      .then((user) => {
        if (!user) return refuse(socket, 401, 'Unauthorized');
        const sid = (req as IncomingMessage & { sessionID?: string }).sessionID;
        wss.handleUpgrade(req, socket, head, (ws) => {
          owners.set(ws, { userId: user.id, sid });
          onConnection(ws, user);
        });
      })
      .catch((err: unknown) => {
        log.error('ws: session check failed', err);
        // The session lives in the database: while it is away, say so rather than fail.
        if (isConnectionFailure(err)) refuse(socket, 503, 'Service Unavailable');
        else refuse(socket, 500, 'Internal Server Error');
      });
  };

  const onConnection = (ws: WebSocket, user: SessionUser) => {
    // Closing is what bounds a client that will not read or will not stop: nothing is dropped silently.
    const closeClient = (code: number, reason: string, stopReading: boolean) => {
      opts.hub.removeClient(client);
      ws.close(code, reason);
      // A flood still in the socket is left unread rather than parsed only to be ignored.
      if (stopReading) ws.pause();
      setTimeout(() => ws.terminate(), CLOSE_HANDSHAKE_MS).unref();
    };
    const client = new ClientSender(ws, user, {
      onOverBudget: () => {
        log.warn(`ws: closed a client of user ${user.id} with code ${CLIENT_TOO_SLOW_CODE}: ${ws.bufferedAmount} bytes were waiting (budget ${CLIENT_BUDGET_BYTES})`);
        closeClient(CLIENT_TOO_SLOW_CODE, 'Too far behind: not reading what the server sends', false);
      },
    });
    const rate = new MessageRate();
    senders.set(ws, client);
    awaitedPong.set(ws, null);
    ws.on('pong', (data) => {
      const awaited = awaitedPong.get(ws);
      if (awaited && data.equals(awaited)) awaitedPong.set(ws, null);
    });
    ws.on('close', () => {
      senders.delete(ws);
      opts.hub.removeClient(client);
    });
    ws.on('error', () => ws.terminate());
    ws.on('message', (data, isBinary) => {
      // A client being closed gets nothing more, so its requests are not served.
      if (!client.isOpen) return;
      if (!rate.take()) {
        log.warn(`ws: closed a client of user ${user.id} with code ${CLIENT_FLOOD_CODE}: more than ${CLIENT_MESSAGES_PER_S} messages a second`);
        return closeClient(CLIENT_FLOOD_CODE, 'Too many messages', true);
      }
      let parsed: unknown;
      try {
        parsed = isBinary ? null : JSON.parse(String(data));
      } catch {
        parsed = null;
      }
      const msg = ClientMessageSchema.safeParse(parsed);
      if (!msg.success) return client.send({ type: 'error', message: `Invalid message: ${msg.error.issues[0]?.message ?? 'not JSON'}` });
      const m = msg.data;
      if (m.type === 'ping') return client.send({ type: 'pong', id: m.id, serverTimeMs: Date.now() });
      if (m.type === 'unsubscribe') return opts.hub.unsubscribe(client, m.topic);
      opts.hub.subscribe(client, m.topic, m.after).catch((err: unknown) => {
        log.error('ws: subscribe failed', err);
        client.send({ type: 'error', message: 'Subscribe failed', topic: m.topic });
      });
    });
    client.send({ type: 'hello', serverTimeMs: Date.now(), user: { id: user.id, role: user.role } });
  };

  const heartbeat = setInterval(() => {
    for (const ws of wss.clients) {
      if (awaitedPong.get(ws)) {
        ws.terminate();
        continue;
      }
      const nonce = randomBytes(PING_NONCE_BYTES);
      awaitedPong.set(ws, nonce);
      ws.ping(nonce);
    }
  }, opts.heartbeatMs ?? HEARTBEAT_MS);
  heartbeat.unref();
  const budgetCheck = setInterval(() => {
    for (const client of senders.values()) client.checkBudget();
  }, opts.budgetCheckMs ?? BUDGET_CHECK_MS);
  budgetCheck.unref();

  httpServer.on('upgrade', onUpgrade);
  return {
    clients: () => wss.clients.size,
    closeSession: (sid) => {
      for (const ws of wss.clients) if (owners.get(ws)?.sid === sid) ws.close(SESSION_ENDED_CODE, 'Signed out');
    },
    closeUser: (userId, keepSid) => {
      for (const ws of wss.clients) {
        const owner = owners.get(ws);
        if (owner?.userId === userId && (keepSid === undefined || owner.sid !== keepSid)) ws.close(SESSION_ENDED_CODE, 'Session ended');
      }
    },
    close: () =>
      new Promise<void>((resolve) => {
        clearInterval(heartbeat);
        clearInterval(budgetCheck);
        httpServer.off('upgrade', onUpgrade);
        for (const ws of wss.clients) ws.terminate();
        wss.close(() => resolve());
      }),
  };
}
