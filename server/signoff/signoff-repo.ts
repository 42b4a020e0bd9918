import { QueryTypes, type Sequelize } from 'sequelize';
import { RunSnapshotSchema, type RunSnapshot, type SignoffAction } from '../../shared/schemas/signoff.js';

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

  /** One entry with its frozen snapshot, or null. */
  async get(runId: number, id: number): Promise<{ entry: StoredSignoff; snapshot: RunSnapshot } | null> {
    const [row] = await this.sequelize.query<SignoffRow>('SELECT * FROM run_signoffs WHERE runId = ? AND id = ?', {
      replacements: [runId, id],
      type: QueryTypes.SELECT,
    });
    return row ? { entry: toStored(row), snapshot: RunSnapshotSchema.parse(JSON.parse(row.snapshot)) } : null;
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
