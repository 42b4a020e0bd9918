import { QueryTypes, type Sequelize } from 'sequelize';
import type { Run } from '../../shared/schemas/run.js';
import type { RunSnapshot } from '../../shared/schemas/signoff.js';
import { RunsRepo } from '../runs/runs-repo.js';

/**
 * The run as a sign-off freezes it: identity, settings the verdict used, summary (verdict and
 * protection results inside), notes, and the change markers. Any edit of the name, tags, pack
 * link (they bump `updatedAt`), the summary or a note (each edit adds a revision) changes it.
 */
export async function runSnapshot(sequelize: Sequelize, run: Run): Promise<RunSnapshot> {
  const events = await new RunsRepo(sequelize).events(run.id);
  const notes = events.flatMap((stored) =>
    stored.event.type === 'annotation' ? [{ eventId: stored.id, elapsedSeconds: stored.event.elapsedSeconds, text: stored.event.text, author: stored.event.author ?? null }] : [],
  );
  const [counted] = await sequelize.query<{ n: number | string }>('SELECT COUNT(*) AS n FROM run_note_revisions WHERE runId = ?', {
    replacements: [run.id],
    type: QueryTypes.SELECT,
  });
  return {
    runId: run.id,
    name: run.name,
    tags: run.tags,
    kind: run.kind,
    state: run.state,
    batteryId: run.batteryId,
    startedAt: run.startedAt,
    endedAt: run.endedAt,
    endVolts: run.endVolts,
    acceptancePercent: run.acceptancePercent,
    summary: run.summary,
    notes,
    changeMarkers: { runUpdatedAt: run.updatedAt, noteRevisionCount: Number(counted?.n ?? 0) },
  };
}

/**
 * The snapshot as it was frozen before run time was renamed `elapsedSeconds`: notes and
 * protection trips said `t`. A sign-off frozen then keeps holding while the run is unchanged,
 * because its hash is compared with this form's hash as well. vocab-rename: keep
 */
export function snapshotInLegacyKeys(snapshot: RunSnapshot): unknown {
  const legacy = ({ elapsedSeconds, ...rest }: { elapsedSeconds: number }) => ({ ...rest, t: elapsedSeconds }); // vocab-rename: keep
  const summary = snapshot.summary ? { ...snapshot.summary, protectionTrips: snapshot.summary.protectionTrips.map(legacy) } : null;
  return { ...snapshot, summary, notes: snapshot.notes.map(legacy) };
}
