/**
 * What the server knows about its database right now: `up`; `stalled` (the process exists but
 * does not answer, e.g. stopped with SIGSTOP or stuck on disk); `down` (the process is gone);
 * `restarting` (the supervisor is starting it again); `unreachable` (a database the server does
 * not supervise does not answer).
 */
export type DatabaseState = 'up' | 'stalled' | 'down' | 'restarting' | 'unreachable';

/** The health endpoint's view of the database. */
export interface DatabaseStatus {
  state: DatabaseState;
  /** True when this server provisioned the MariaDB and restarts it when it dies. */
  supervised: boolean;
  /** When the current state began (ISO 8601). */
  since: string;
  restarts: number;
  lastRestartAt: string | null;
  /** The last thing that went wrong, in words (null until something did). */
  lastProblem: string | null;
}

declare module '../app-context.js' {
  interface AppServices {
    databaseHealth: DatabaseHealth;
  }
}

/** Holds the database state and tells listeners when it changes. No I/O here. */
export class DatabaseHealth {
  private current: DatabaseStatus;
  private readonly listeners = new Set<(status: DatabaseStatus) => void>();

  constructor(supervised: boolean, private readonly now: () => number = Date.now) {
    this.current = { state: 'up', supervised, since: new Date(now()).toISOString(), restarts: 0, lastRestartAt: null, lastProblem: null };
  }

  /** A copy of the current status. */
  status(): DatabaseStatus {
    return { ...this.current };
  }

  /** True while queries can be expected to answer. */
  available(): boolean {
    return this.current.state === 'up';
  }

  /** Moves to `state`; `problem` records why (kept after recovery for the admins to read). */
  set(state: DatabaseState, problem?: string): void {
    if (problem !== undefined) this.current.lastProblem = problem;
    if (state === this.current.state) return;
    this.current = { ...this.current, state, since: new Date(this.now()).toISOString() };
    for (const listener of this.listeners) listener(this.status());
  }

  /** Counts a successful restart. */
  restarted(): void {
    this.current.restarts++;
    this.current.lastRestartAt = new Date(this.now()).toISOString();
  }

  /** Calls `listener` on every state change; returns the unsubscribe function. */
  onChange(listener: (status: DatabaseStatus) => void): () => void {
    this.listeners.add(listener);
    return () => void this.listeners.delete(listener);
  }

  /** A sentence for a 503 answer: what is wrong and what still works. */
  unavailableMessage(): string {
    const what: Record<DatabaseState, string> = {
      up: 'is available',
      stalled: 'is not answering (stalled)',
      down: 'has stopped and will be restarted',
      restarting: 'is being restarted',
      unreachable: 'cannot be reached',
    };
    return `The database ${what[this.current.state]}. Recording and live readings continue; try again in a few seconds.`;
  }
}
