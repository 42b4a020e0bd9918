import { QueryTypes, type Sequelize } from 'sequelize';
import type { InspectionItem, InspectionRating } from '../../shared/schemas/inspection.js';

interface ItemRow {
  id: number;
  title: string;
  position: number;
  archived: number | boolean;
}

/** One pack's rating of one item as stored. */
export interface StoredInspectionEntry {
  itemId: number;
  rating: InspectionRating | null;
  note: string | null;
  updatedAt: string;
}

const toItem = (row: ItemRow): InspectionItem => ({ id: row.id, title: row.title, position: row.position, archived: Boolean(row.archived) });

/** The lab's teardown checklist (inspection_items) and each pack's ratings (battery_inspections). */
export class InspectionRepo {
  constructor(private readonly sequelize: Sequelize) {}

  /** Every checklist item in checklist order, retired ones included. */
  async items(): Promise<InspectionItem[]> {
    const rows = await this.sequelize.query<ItemRow>('SELECT id, title, position, archived FROM inspection_items ORDER BY position, id', { type: QueryTypes.SELECT });
    return rows.map(toItem);
  }

  /** One item, or null. */
  async item(id: number): Promise<InspectionItem | null> {
    const rows = await this.sequelize.query<ItemRow>('SELECT id, title, position, archived FROM inspection_items WHERE id = ?', { replacements: [id], type: QueryTypes.SELECT });
    return rows[0] ? toItem(rows[0]) : null;
  }

  /** Adds an item at `position`, or after the last one. */
  async addItem(title: string, position?: number): Promise<InspectionItem> {
    const [last] = await this.sequelize.query<{ top: number | null }>('SELECT MAX(position) AS top FROM inspection_items', { type: QueryTypes.SELECT });
    const at = position ?? Number(last?.top ?? 0) + 1;
    const [id] = await this.sequelize.query(
      'INSERT INTO inspection_items (title, position, archived, createdAt, updatedAt) VALUES (?, ?, FALSE, NOW(3), NOW(3))',
      { replacements: [title, at], type: QueryTypes.INSERT },
    );
    return (await this.item(Number(id)))!;
  }

  /** Renames, moves or retires an item. */
  async patchItem(id: number, change: { title?: string; position?: number; archived?: boolean }): Promise<InspectionItem | null> {
    const sets: string[] = [];
    const values: unknown[] = [];
    for (const [column, value] of Object.entries(change)) {
      if (value === undefined) continue;
      sets.push(`${column} = ?`); // column names come from the zod schema's keys, never from the request text
      values.push(value);
    }
    await this.sequelize.query(`UPDATE inspection_items SET ${sets.join(', ')}, updatedAt = NOW(3) WHERE id = ?`, { replacements: [...values, id] });
    return this.item(id);
  }

  /** A pack's ratings, by item. */
  async entries(batteryId: number): Promise<StoredInspectionEntry[]> {
    const rows = await this.sequelize.query<{ itemId: number; rating: InspectionRating | null; note: string | null; updatedAt: Date | string }>(
      'SELECT itemId, rating, note, updatedAt FROM battery_inspections WHERE batteryId = ?',
      { replacements: [batteryId], type: QueryTypes.SELECT },
    );
    return rows.map((r) => ({ ...r, updatedAt: new Date(r.updatedAt).toISOString() }));
  }

  /** Sets (or replaces) a pack's rating and note for one item. */
  async rate(batteryId: number, itemId: number, rating: InspectionRating | null, note: string | null, userId: number): Promise<StoredInspectionEntry> {
    await this.sequelize.query(
      `INSERT INTO battery_inspections (batteryId, itemId, rating, note, updatedById, createdAt, updatedAt) VALUES (?, ?, ?, ?, ?, NOW(3), NOW(3))
       ON DUPLICATE KEY UPDATE rating = VALUES(rating), note = VALUES(note), updatedById = VALUES(updatedById), updatedAt = NOW(3)`,
      { replacements: [batteryId, itemId, rating, note, userId] },
    );
    const entry = (await this.entries(batteryId)).find((e) => e.itemId === itemId);
    return entry!;
  }
}
