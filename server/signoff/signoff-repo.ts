import { QueryTypes, type Sequelize } from 'sequelize';
import { snapshotWithCurrentKeys } from '../../shared/schemas/legacy-keys.js';
import { RunSnapshotSchema, type RunSnapshot, type SignoffAction } from '../../shared/schemas/signoff.js';
import { textHash } from './canonical-json.js';

/** One stored row of a run's review history. */
export interface StoredSignoff {
  id: number;
  runId: number;
  action: SignoffAction;
  comment: string;
  contentHash: string;
  byId: number | null;
  byName: string;
  byRole: string;
  at: string;
}

interface SignoffRow extends Omit<StoredSignoff, 'at'> {
  snapshot: string;
  createdAt: Date | string;
}

const toStored = (row: SignoffRow): StoredSignoff => ({
  id: row.id,
  runId: row.runId,
  action: row.action,
  comment: row.comment,
  contentHash: row.contentHash,
  byId: row.byId,
  byName: row.byName,
  byRole: row.byRole,
  at: new Date(row.createdAt).toISOString(),
});

/** Who made an entry. */
export interface SignoffAuthor {
  id: number;
  name: string;
  role: string;
}

/** Data access for run_signoffs: insert and read only (the history is never changed). */
export class SignoffRepo {
  constructor(private readonly sequelize: Sequelize) {}

  /** Every entry of a run, oldest first. */
  async list(runId: number): Promise<StoredSignoff[]> {
    const rows = await this.sequelize.query<SignoffRow>(
      'SELECT id, runId, action, comment, contentHash, byId, byName, byRole, createdAt FROM run_signoffs WHERE runId = ? ORDER BY id',
      { replacements: [runId], type: QueryTypes.SELECT },
    );
    return rows.map(toStored);
  }

  /**
   * One entry with its frozen snapshot, or null. `verified`: the stored bytes still hash to the
   * entry's `contentHash`. The snapshot is shown with current keys (one frozen before a rename
   * says `t` for run time); the hash is checked over the bytes as stored, never over that copy.
   */
  async get(runId: number, id: number): Promise<{ entry: StoredSignoff; snapshot: RunSnapshot; verified: boolean } | null> {
    const [row] = await this.sequelize.query<SignoffRow>('SELECT * FROM run_signoffs WHERE runId = ? AND id = ?', {
      replacements: [runId, id],
      type: QueryTypes.SELECT,
    });
    if (!row) return null;
    const snapshot = RunSnapshotSchema.parse(snapshotWithCurrentKeys(JSON.parse(row.snapshot)));
    return { entry: toStored(row), snapshot, verified: textHash(row.snapshot) === row.contentHash };
  }

  /** Appends an entry. */
  async insert(runId: number, action: SignoffAction, comment: string, snapshotJson: string, hash: string, by: SignoffAuthor): Promise<void> {
    await this.sequelize.query(
      `INSERT INTO run_signoffs (runId, action, comment, snapshot, contentHash, byId, byName, byRole, createdAt)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, NOW(3))`,
      { replacements: [runId, action, comment, snapshotJson, hash, by.id, by.name, by.role], type: QueryTypes.INSERT },
    );
  }
}
