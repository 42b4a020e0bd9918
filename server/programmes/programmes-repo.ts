import { QueryTypes, type Sequelize } from 'sequelize';
import { ProgrammeInputSchema, type Programme, type ProgrammeInput } from '../../shared/schemas/programme.js';
import { utcDateTime } from '../db/utc-datetime.js';

interface ProgrammeRow {
  id: number;
  name: string;
  body: string | Record<string, unknown>;
  createdAt: Date | string;
  updatedAt: Date | string;
}

const iso = (d: Date | string) => new Date(d).toISOString();

/** A row back to the API's shape; the body is checked again, so a hand-edited row cannot pass bad steps on. */
function toProgramme(row: ProgrammeRow): Programme {
  const body = ProgrammeInputSchema.parse(typeof row.body === 'string' ? JSON.parse(row.body) : row.body);
  return { ...body, id: row.id, name: row.name, description: body.description ?? null, createdAt: iso(row.createdAt), updatedAt: iso(row.updatedAt) };
}

/** Saved test programmes: the steps and the pack they are written for, as one JSON body. */
export class ProgrammesRepo {
  constructor(private readonly sequelize: Sequelize) {}

  /** Every programme, by name. */
  async list(): Promise<Programme[]> {
    const rows = await this.sequelize.query<ProgrammeRow>('SELECT * FROM programmes ORDER BY name, id', { type: QueryTypes.SELECT });
    return rows.map(toProgramme);
  }

  /** One programme, or null. */
  async get(id: number): Promise<Programme | null> {
    const [row] = await this.sequelize.query<ProgrammeRow>('SELECT * FROM programmes WHERE id = ?', { replacements: [id], type: QueryTypes.SELECT });
    return row ? toProgramme(row) : null;
  }

  /** Stores a new programme (userId null: the demo seed's own). */
  async create(input: ProgrammeInput, userId: number | null): Promise<Programme> {
    const now = utcDateTime(new Date());
    const [id] = await this.sequelize.query('INSERT INTO programmes (name, body, createdById, createdAt, updatedAt) VALUES (?, ?, ?, ?, ?)', {
      replacements: [input.name, JSON.stringify(input), userId, now, now],
      type: QueryTypes.INSERT,
    });
    return (await this.get(Number(id)))!;
  }

  /** Replaces a programme's body; null when it does not exist. Runs that follow it keep their own copy. */
  async replace(id: number, input: ProgrammeInput): Promise<Programme | null> {
    await this.sequelize.query('UPDATE programmes SET name = ?, body = ?, updatedAt = ? WHERE id = ?', {
      replacements: [input.name, JSON.stringify(input), utcDateTime(new Date()), id],
    });
    return this.get(id);
  }

  /** Removes a programme; false when there was none. */
  async remove(id: number): Promise<boolean> {
    const found = await this.get(id);
    if (!found) return false;
    await this.sequelize.query('DELETE FROM programmes WHERE id = ?', { replacements: [id] });
    return true;
  }
}
