import { readFile } from 'node:fs/promises';
import sharp from 'sharp';
import type { Battery } from '../../shared/schemas/battery.js';
import type { InspectionRating } from '../../shared/schemas/inspection.js';
import type { ProtectionRecordRow } from '../../shared/schemas/protection-check.js';
import type { Run } from '../../shared/schemas/run.js';
import type { LabSettings } from '../../shared/schemas/lab-settings.js';
import { protectionRecord } from '../batteries/protection-record.js';
import { toApiBattery } from '../db/models/battery.js';
import { InspectionRepo } from '../inspection/inspection-repo.js';
import { PhotoFiles } from '../photos/photo-files.js';
import { PhotosRepo, type PhotoRecord } from '../photos/photos-repo.js';
import { RunsRepo } from '../runs/runs-repo.js';
import { getLabSettings } from '../settings/settings-service.js';
import type { ReportDeps } from './run-report.js';

/** Most runs a pack report lists (a pack tested weekly for ten years stays under this). */
const PACK_RUNS_MAX = 500;
/** Longest side of an embedded photo, px: twice the report's 96 pt box, sharp enough on paper. */
const REPORT_PHOTO_PX = 192;
const REPORT_PHOTO_QUALITY = 75;

/** The stored thumbnail made smaller for the report (a baseline JPEG pdfkit embeds as is); null when the file is missing or unreadable. */
async function reportJpeg(path: string): Promise<Buffer | null> {
  try {
    return await sharp(await readFile(path)).resize(REPORT_PHOTO_PX, REPORT_PHOTO_PX, { fit: 'inside', withoutEnlargement: true }).jpeg({ quality: REPORT_PHOTO_QUALITY }).toBuffer();
  } catch {
    return null;
  }
}

/** A photo as the report embeds it: a small JPEG made from its thumbnail, or null when the file is missing. */
export interface ReportPhoto {
  fileName: string;
  jpeg: Buffer | null;
}

/** One checklist line of the pack's teardown inspection, with its photos. */
export interface ReportInspectionEntry {
  title: string;
  rating: InspectionRating | null;
  note: string | null;
  photos: ReportPhoto[];
}

/** What a pack report shows. */
export interface PackReportInput {
  battery: Battery;
  /** Print the price (a share link's choice; off unless asked). */
  includePrices: boolean;
  /** Every run of the pack, newest first. */
  runs: Run[];
  protectionRows: ProtectionRecordRow[];
  inspection: ReportInspectionEntry[];
  /** Photos filed under no checklist item. */
  otherPhotos: ReportPhoto[];
  settings: LabSettings;
  madeAt: Date;
}

/** What the pack report reads besides the database: the photo files, and a run's live figures. */
export interface PackReportDeps extends ReportDeps {
  dataDir: string;
  live?: (run: Run) => Run;
}

/**
 * Everything a pack's report prints, read now: the pack, its runs, its protection record, its
 * teardown inspection with each photo (its thumbnail made to fit REPORT_PHOTO_PX), and the lab's
 * settings; null when the pack does not exist.
 */
export async function loadPackReport(deps: PackReportDeps, batteryId: number, includePrices: boolean, madeAt: Date): Promise<PackReportInput | null> {
  const row = await deps.models.Battery.findByPk(batteryId);
  if (!row) return null;
  const live = deps.live ?? ((run: Run) => run);
  const inspection = new InspectionRepo(deps.sequelize);
  const files = new PhotoFiles(deps.dataDir);
  const [{ runs }, protectionRows, items, entries, photos, settings] = await Promise.all([
    new RunsRepo(deps.sequelize).list({ batteryId, limit: PACK_RUNS_MAX, offset: 0 }),
    protectionRecord(deps.sequelize, batteryId, live),
    inspection.items(),
    inspection.entries(batteryId),
    new PhotosRepo(deps.sequelize).ofBattery(batteryId),
    getLabSettings(deps.models),
  ]);
  const embedded = new Map<number, ReportPhoto>();
  await Promise.all(
    photos.map(async (p: PhotoRecord) => {
      embedded.set(p.id, { fileName: p.fileName, jpeg: await reportJpeg(files.pathOf(p.storageKey, 'thumb', p.format)) });
    }),
  );
  const photosOf = (itemId: number | null) => photos.filter((p) => p.itemId === itemId).map((p) => embedded.get(p.id)!);
  const byItem = new Map(entries.map((e) => [e.itemId, e]));
  return {
    battery: toApiBattery(row),
    includePrices,
    runs: runs.map(live),
    protectionRows,
    inspection: items
      .filter((item) => byItem.has(item.id) || photosOf(item.id).length > 0)
      .map((item) => ({ title: item.title, rating: byItem.get(item.id)?.rating ?? null, note: byItem.get(item.id)?.note ?? null, photos: photosOf(item.id) })),
    otherPhotos: photosOf(null),
    settings,
    madeAt,
  };
}
