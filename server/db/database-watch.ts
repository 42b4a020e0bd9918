import type { DatabaseHealth } from './database-health.js';
import type { DatabaseProbe } from './database-probe.js';
import type { Logger } from '../log/logger.js';

/** The private MariaDB as the supervisor sees it (the provisioner implements it). */
export interface SupervisedServer {
  /** The running mariadbd on this data, and whether it is stopped (SIGSTOP); undefined when none runs. */
  running(): { pid: number; stopped: boolean } | undefined;
  /** Starts the server on the same data, port and socket unless one already runs; resolves its pid. */
  ensureRunning(): Promise<number>;
}

/** How often the database is asked whether it answers. */
export const PROBE_INTERVAL_MS = 250;
/** A ping slower than this counts as late (see LATE_PINGS_FOR_STALL for when that makes a stall). */
export const PROBE_TIMEOUT_MS = 1000;
/** Waits before each consecutive restart attempt; the last value repeats. */
export const RESTART_DELAYS_MS = [0, 1000, 2000, 5000, 10_000, 30_000] as const;
/**
 * Late pings in a row before a server that is alive and not stopped counts as stalled: one
 * late ping on a busy machine is not an outage. A stopped (SIGSTOP) or vanished process is
 * known at the first late ping.
 */
export const LATE_PINGS_FOR_STALL = 2;
/** Up this long after a restart, and the back-off starts again from the first delay. */
export const STABLE_AFTER_RESTART_MS = 60_000;

export interface WatchOptions {
  health: DatabaseHealth;
  probe: DatabaseProbe;
  /** Absent when the server did not provision the database: then it is only watched, never restarted. */
  server?: SupervisedServer;
  /** Every step of the watch (restarts, stalls, recoveries); lines are written as warnings. */
  log: Logger;
  intervalMs?: number;
  probeTimeoutMs?: number;
  restartDelaysMs?: readonly number[];
  now?: () => number;
}

/** A running watch; `tick()` runs one check at once (tests), `stop()` ends the loop. */
export interface DatabaseWatch {
  tick(): Promise<void>;
  stop(): Promise<void>;
}

/**
 * Watches the database: pings it every PROBE_INTERVAL_MS and keeps `health` current. When the
 * supervised MariaDB has died it is started again on the same data, at once the first time
 * and then with growing delays while it keeps dying; every step is logged. A stalled server
 * (alive but silent) is reported, not killed: a stop signal or a slow disk may pass.
 */
export function watchDatabase(opts: WatchOptions): DatabaseWatch {
  const now = opts.now ?? Date.now;
  const delays = opts.restartDelaysMs ?? RESTART_DELAYS_MS;
  const timeoutMs = opts.probeTimeoutMs ?? PROBE_TIMEOUT_MS;
  let attempt = 0;
  let nextRestartAt = 0;
  let lastRestartMs: number | undefined;
  let outageStartMs: number | undefined;
  let latePings = 0;
  let stopped = false;
  let stoppedPid: number | undefined;
  let timer: NodeJS.Timeout | undefined;
  let running: Promise<void> = Promise.resolve();

  const restartIfDue = async (server: SupervisedServer) => {
    const { health } = opts;
    const state = health.status().state;
    if (state !== 'down') {
      health.set('down', 'the MariaDB server process has exited');
      opts.log.warn('the server process has exited; restarting it');
      // Dead again right after a restart: the delay that attempt set stands.
      if (state !== 'restarting') nextRestartAt = now() + delays[Math.min(attempt, delays.length - 1)]!;
    }
    if (now() < nextRestartAt || stopped) return;
    health.set('restarting');
    const started = now();
    try {
      const pid = await server.ensureRunning();
      health.restarted();
      lastRestartMs = now();
      opts.log.warn(`restarted (pid ${pid}) in ${now() - started} ms; restarts so far: ${health.status().restarts}`);
    } catch (err) {
      health.set('down', `restart failed: ${err instanceof Error ? err.message.split('\n')[0] : String(err)}`);
      opts.log.warn('restart failed', err);
    }
    attempt++;
    nextRestartAt = now() + delays[Math.min(attempt, delays.length - 1)]!;
  };

  const check = async () => {
    const { health } = opts;
    if (await opts.probe.check(timeoutMs)) {
      if (!health.available()) {
        opts.log.warn(`answering again after ${outageStartMs === undefined ? '?' : ((now() - outageStartMs) / 1000).toFixed(1)} s`);
      }
      outageStartMs = undefined;
      stoppedPid = undefined;
      latePings = 0;
      health.set('up');
      if (lastRestartMs !== undefined && now() - lastRestartMs >= STABLE_AFTER_RESTART_MS) attempt = 0;
      return;
    }
    if (outageStartMs === undefined) outageStartMs = now();
    latePings++;
    const proc = opts.server?.running();
    if (opts.server && !proc) return restartIfDue(opts.server);
    if (!proc?.stopped && latePings < LATE_PINGS_FOR_STALL) return;
    if (!opts.server) {
      if (health.available()) opts.log.warn('the database does not answer');
      return health.set('unreachable', `no answer within ${timeoutMs} ms, ${latePings} times in a row`);
    }
    // A process seen stopped in this outage stays part of the reason: right after SIGCONT it runs
    // again but its answers are still late, which is the same stall, not a new cause.
    if (proc!.stopped) stoppedPid = proc!.pid;
    const late = `gave no answer within ${timeoutMs} ms, ${latePings} times in a row`;
    const why = proc!.stopped ? `the server process (pid ${proc!.pid}) is stopped (SIGSTOP)`
      : stoppedPid !== undefined ? `the server process (pid ${stoppedPid}) was stopped (SIGSTOP), runs again and ${late}`
      : `the server (pid ${proc!.pid}) ${late}`;
    if (health.available()) opts.log.warn(`stalled: ${why}`);
    health.set('stalled', why);
  };

  const tick = () => (running = running.then(check).catch((err: unknown) => opts.log.error('watch failed', err)));
  const loop = () => {
    if (stopped) return;
    void tick().then(() => {
      if (!stopped) timer = setTimeout(loop, opts.intervalMs ?? PROBE_INTERVAL_MS);
    });
  };
  timer = setTimeout(loop, opts.intervalMs ?? PROBE_INTERVAL_MS);
  return {
    tick,
    async stop() {
      stopped = true;
      clearTimeout(timer);
      await running;
      await opts.probe.close();
    },
  };
}
