import type { Sequelize } from 'sequelize';
import { DatabaseUnavailableError } from './connection-errors.js';
import type { DatabaseHealth } from './database-health.js';

type Query = Sequelize['query'];
interface Pending {
  reject: (err: Error) => void;
}
interface PoolConnectionManager {
  disconnect(connection: unknown): Promise<void>;
}

/**
 * Makes every query through `sequelize` fail fast while `health` says the database is away:
 * a new query is refused at once, and queries already waiting are refused the moment the
 * state changes (so a request never hangs for a whole stall). The refused query itself keeps
 * its connection until the server answers. A transaction caught half-way has its ROLLBACK
 * refused too, so Sequelize discards its connection; while the database is away that
 * connection is closed in the background (the server rolls the transaction back when the
 * connection ends) instead of making the caller wait for the end of the stall. (The driver's
 * own destroy() is not used: mariadb 3.0.2 leaves an unhandled rejection behind when it
 * kills a connection with a query in flight.) Returns a function that removes the guard.
 */
export function guardQueries(sequelize: Sequelize, health: DatabaseHealth): () => void {
  const original = sequelize.query.bind(sequelize) as (...args: unknown[]) => Promise<unknown>;
  const pending = new Set<Pending>();
  const refuse = () => new DatabaseUnavailableError(health.unavailableMessage());

  const guarded = (...args: unknown[]): Promise<unknown> => {
    if (!health.available()) return Promise.reject(refuse());
    return new Promise((resolve, reject) => {
      const entry: Pending = { reject };
      pending.add(entry);
      original(...args).then(resolve, reject).finally(() => pending.delete(entry));
    });
  };
  sequelize.query = guarded as Query;
  const manager = sequelize.connectionManager as unknown as PoolConnectionManager;
  const disconnect = manager.disconnect.bind(manager);
  manager.disconnect = (connection) => {
    if (health.available()) return disconnect(connection);
    void disconnect(connection).catch(() => undefined);
    return Promise.resolve();
  };

  const off = health.onChange((status) => {
    if (status.state === 'up') return;
    for (const entry of [...pending]) {
      pending.delete(entry);
      entry.reject(refuse());
    }
  });
  return () => {
    off();
    sequelize.query = original as Query;
    manager.disconnect = disconnect;
  };
}
