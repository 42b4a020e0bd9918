import mariadb from 'mariadb';
import type { DatabaseConfig } from '../config/config.js';

/** Asks the database whether it answers, within a time limit. */
export interface DatabaseProbe {
  /** Resolves true when the database answered within `timeoutMs`; never rejects. Calls must not overlap. */
  check(timeoutMs: number): Promise<boolean>;
  close(): Promise<void>;
}

/** Closes a connection in the background, after whatever it is still waiting for. */
function quietly(connection: mariadb.Connection): void {
  connection.end().catch(() => undefined);
}

/**
 * A probe over one connection of its own (never the app's pool, which a stall can fill):
 * pings on it, and drops and reopens it when a ping fails or is late. A closed TCP port
 * answers at once; a stopped server accepts the connection but never greets, so the
 * time limit is what tells a stall.
 */
export function createPingProbe(db: DatabaseConfig): DatabaseProbe {
  let connection: mariadb.Connection | undefined;
  const open = async (timeoutMs: number) => {
    const c = await mariadb.createConnection({
      host: db.host, port: db.port, user: db.user, password: db.password, database: db.database, connectTimeout: timeoutMs,
    });
    c.on('error', () => undefined); // a dropped socket is what the next check reports
    return c;
  };
  return {
    async check(timeoutMs) {
      const reused = connection;
      const work = (async () => {
        const c = reused ?? (await open(timeoutMs));
        await c.ping();
        return c;
      })();
      let timer: NodeJS.Timeout | undefined;
      const late = new Promise<undefined>((resolve) => (timer = setTimeout(() => resolve(undefined), timeoutMs)));
      const answered = await Promise.race([work.catch(() => undefined), late]);
      clearTimeout(timer);
      if (answered) {
        connection = answered;
        return true;
      }
      if (connection === reused) connection = undefined;
      // end(), never destroy(): mariadb 3.0.2's destroy() of a connection with a command in
      // flight opens a second connection to KILL it, and that path throws an unhandled
      // rejection (crashing the server) once a stopped server answers again. end() waits
      // for the late ping, then closes.
      if (reused) quietly(reused);
      // A connection that completes after the limit is closed, not leaked.
      void work.then((c) => c !== connection && quietly(c), () => undefined);
      return false;
    },
    async close() {
      if (connection) quietly(connection);
      connection = undefined;
    },
  };
}
