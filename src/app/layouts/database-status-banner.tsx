import type { PublicUser } from '../../../shared/schemas/user';
import type { DatabaseStatusBody } from '../../../shared/schemas/health';
import { useServerHealth } from '../../lib/use-server-health';

const STATE_WORDS: Record<DatabaseStatusBody['state'], string> = {
  up: 'available',
  stalled: 'not answering',
  down: 'stopped; the server is restarting it',
  restarting: 'being restarted',
  unreachable: 'out of reach',
};

const when = (iso: string) => new Date(iso).toLocaleString();

/**
 * A line above every page while the database is away (everyone: what still works), and for
 * lab managers a note of the database's restarts since the server started and of a failing
 * scheduled backup.
 */
export function DatabaseStatusBanner({ user }: { user: PublicUser | null | undefined }) {
  const health = useServerHealth();
  const db = health.data?.database;
  if (!db) return null;
  if (db.state !== 'up') {
    return (
      <div role="alert" className="border-b border-state-cutoff/60 bg-state-cutoff/10 px-4 py-2 text-sm text-ink">
        <span className="font-semibold">The database is {STATE_WORDS[db.state]}</span> (since {when(db.since)}). Readings are still
        recorded and shown live; lists, reports and changes work again once it is back.
        {user?.role === 'admin' && db.lastProblem && <span className="text-ink-muted"> Cause: {db.lastProblem}.</span>}
      </div>
    );
  }
  if (user?.role !== 'admin') return null;
  const backupsFailing = health.data?.backups?.failing === true;
  if (db.restarts === 0 && !backupsFailing) return null;
  if (db.restarts === 0) {
    return (
      <div role="status" className="border-b border-state-cutoff/60 bg-state-cutoff/10 px-4 py-2 text-sm text-ink">
        The last scheduled backup did not complete; the server log has the reason. Earlier backups are kept.
      </div>
    );
  }
  return (
    <div role="status" className="border-b border-line bg-surface-sunken px-4 py-2 text-sm text-ink-muted">
      The database was restarted {db.restarts === 1 ? 'once' : `${db.restarts} times`} since the server started, last at{' '}
      {db.lastRestartAt ? when(db.lastRestartAt) : 'an unknown time'}
      {db.lastProblem ? ` (${db.lastProblem})` : ''}. It is available again; the server log has the details.
      {backupsFailing && ' The last scheduled backup did not complete either.'}
    </div>
  );
}
