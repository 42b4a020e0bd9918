import type { Sequelize, Transaction } from 'sequelize';
import { DatabaseUnavailableError } from './connection-errors.js';
import type { DatabaseHealth } from './database-health.js';

type Query = Sequelize['query'];
interface Pending {
  reject: (err: Error) => void;
  transaction?: Transaction | null;
}

/**
 * Makes every query through `sequelize` fail fast while `health` says the database is away:
 * a new query is refused at once, and queries already waiting are refused the moment the
 * state changes (so a request never hangs for a whole stall). A refused query inside a
 * transaction also drops that transaction's connection, so the server rolls it back and no
 * half-done transaction goes back to the pool. A refused plain query keeps its connection
 * until the server answers. Returns a function that removes the guard.
 */
export function guardQueries(sequelize: Sequelize, health: DatabaseHealth): () => void {
  const original = sequelize.query.bind(sequelize) as (...args: unknown[]) => Promise<unknown>;
  const pending = new Set<Pending>();
  const refuse = () => new DatabaseUnavailableError(health.unavailableMessage());

  const dropConnection = (transaction: Transaction | null | undefined) => {
    const connection = (transaction as { connection?: { destroy?: () => void } } | null | undefined)?.connection;
    try {
      connection?.destroy?.();
    } catch {
      // already closed
    }
  };

  const guarded = (...args: unknown[]): Promise<unknown> => {
    const options = args[1] as { transaction?: Transaction | null } | undefined;
    if (!health.available()) {
      dropConnection(options?.transaction);
      return Promise.reject(refuse());
    }
    return new Promise((resolve, reject) => {
      const entry: Pending = { reject, transaction: options?.transaction };
      pending.add(entry);
      original(...args).then(resolve, reject).finally(() => pending.delete(entry));
    });
  };
  sequelize.query = guarded as Query;

  const off = health.onChange((status) => {
    if (status.state === 'up') return;
    for (const entry of [...pending]) {
      pending.delete(entry);
      dropConnection(entry.transaction);
      entry.reject(refuse());
    }
  });
  return () => {
    off();
    sequelize.query = original as Query;
  };
}
