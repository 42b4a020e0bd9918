import { QueryTypes, type Sequelize } from 'sequelize';
import type { Photo } from '../../shared/schemas/inspection.js';
import type { PhotoFormat } from './photo-processing.js';

/** A stored photo row: the API's fields plus where its files are. */
export interface PhotoRecord extends Omit<Photo, 'urls'> {
  storageKey: string;
  format: PhotoFormat;
}

interface PhotoRow {
  id: number;
  batteryId: number;
  itemId: number | null;
  storageKey: string;
  fileName: string;
  format: PhotoFormat;
  widthPx: number;
  heightPx: number;
  bytes: number;
  createdById: number | null;
  createdAt: Date | string;
}

const COLUMNS = 'id, batteryId, itemId, storageKey, fileName, format, widthPx, heightPx, bytes, createdById, createdAt';

const toRecord = ({ createdById, createdAt, ...row }: PhotoRow): PhotoRecord => ({
  ...row, createdBy: createdById, createdAt: new Date(createdAt).toISOString(),
});

/** The API's view of a photo: its fields and the URLs of its copies. */
export function toApiPhoto({ storageKey: _key, format: _format, ...photo }: PhotoRecord): Photo {
  const base = `/api/photos/${photo.id}`;
  return { ...photo, urls: { thumb: `${base}/thumb`, web: `${base}/web`, full: `${base}/full` } };
}

/** The battery_photos table. */
export class PhotosRepo {
  constructor(private readonly sequelize: Sequelize) {}

  /** Stores a photo's row; returns it with its id. */
  async insert(p: Omit<PhotoRecord, 'id' | 'createdAt'>): Promise<PhotoRecord> {
    const [id] = await this.sequelize.query(
      `INSERT INTO battery_photos (batteryId, itemId, storageKey, fileName, format, widthPx, heightPx, bytes, createdById, createdAt)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, NOW(3))`,
      { replacements: [p.batteryId, p.itemId, p.storageKey, p.fileName, p.format, p.widthPx, p.heightPx, p.bytes, p.createdBy], type: QueryTypes.INSERT },
    );
    return (await this.get(Number(id)))!;
  }

  /** One photo, or null. */
  async get(id: number): Promise<PhotoRecord | null> {
    const rows = await this.sequelize.query<PhotoRow>(`SELECT ${COLUMNS} FROM battery_photos WHERE id = ?`, { replacements: [id], type: QueryTypes.SELECT });
    return rows[0] ? toRecord(rows[0]) : null;
  }

  /** Every photo of a pack, oldest first. */
  async ofBattery(batteryId: number): Promise<PhotoRecord[]> {
    const rows = await this.sequelize.query<PhotoRow>(`SELECT ${COLUMNS} FROM battery_photos WHERE batteryId = ? ORDER BY createdAt, id`, { replacements: [batteryId], type: QueryTypes.SELECT });
    return rows.map(toRecord);
  }

  /** Deletes a photo's row. */
  async remove(id: number): Promise<void> {
    await this.sequelize.query('DELETE FROM battery_photos WHERE id = ?', { replacements: [id] });
  }
}
