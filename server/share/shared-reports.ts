import type { Sequelize } from 'sequelize';
import type { Battery } from '../../shared/schemas/battery.js';
import type { LabSettings } from '../../shared/schemas/lab-settings.js';
import type { RunSummary } from '../../shared/schemas/run-summary.js';
import type { SharedBattery, SharedPackReport, SharedRunReport } from '../../shared/schemas/share.js';
import type { CoreModels } from '../db/models/index.js';
import { toApiBattery } from '../db/models/battery.js';
import { InspectionRepo } from '../inspection/inspection-repo.js';
import { PhotosRepo } from '../photos/photos-repo.js';
import { RunsRepo } from '../runs/runs-repo.js';
import { getLabSettings } from '../settings/settings-service.js';
import { SignoffService } from '../signoff/signoff-service.js';
import type { ActiveLink } from './share-repo.js';

/** Most runs a shared pack report lists in its capacity history. */
const PACK_RUNS_MAX = 500;

const sharedLab = (settings: LabSettings) => ({
  name: settings.labName,
  timeZone: settings.timeZone,
  temperatureUnit: settings.temperatureUnit,
  energyUnit: settings.energyUnit,
});

/** A pack without the lab's internal fields; its price only when the link says so. */
export function sharedBattery(battery: Battery, includePrices: boolean): SharedBattery {
  const { notes: _notes, sender: _sender, owner: _owner, createdAt: _c, updatedAt: _u, ...shown } = battery;
  return includePrices ? shown : { ...shown, price: null, priceCurrency: null };
}

/** A summary with the cost per kWh only when the link says so. */
const sharedSummary = (summary: RunSummary | null, includePrices: boolean): RunSummary | null =>
  summary && !includePrices ? { ...summary, costPerKWh: null } : summary;

/** What the shared reports read. */
export interface SharedReportDeps {
  sequelize: Sequelize;
  models: CoreModels;
}

/** The report a run link shows, or null when the run is gone. */
export async function sharedRunReport(deps: SharedReportDeps, link: ActiveLink): Promise<SharedRunReport | null> {
  const runs = new RunsRepo(deps.sequelize);
  const run = await runs.get(link.targetId);
  if (!run) return null;
  const { benchId: _bench, createdBy: _by, readingsCount: _count, alarms: _alarms, summary, ...shown } = run;
  const batteryRow = run.batteryId === null ? null : await deps.models.Battery.findByPk(run.batteryId);
  return {
    kind: 'run',
    lab: sharedLab(await getLabSettings(deps.models)),
    expiresAt: link.expiresAt,
    includePrices: link.includePrices,
    run: shown,
    summary: sharedSummary(summary, link.includePrices),
    battery: batteryRow ? sharedBattery(toApiBattery(batteryRow), link.includePrices) : null,
    events: await runs.events(run.id),
    signoff: await new SignoffService(deps.sequelize).block(run.id),
  };
}

/** The report a pack link shows (specs, capacity history, protection record, inspection), or null when the pack is gone. */
export async function sharedPackReport(deps: SharedReportDeps, link: ActiveLink): Promise<SharedPackReport | null> {
  const row = await deps.models.Battery.findByPk(link.targetId);
  if (!row) return null;
  const { runs } = await new RunsRepo(deps.sequelize).list({ batteryId: row.id, limit: PACK_RUNS_MAX, offset: 0 });
  const inspection = new InspectionRepo(deps.sequelize);
  const [items, entries, photos] = await Promise.all([inspection.items(), inspection.entries(row.id), new PhotosRepo(deps.sequelize).ofBattery(row.id)]);
  const byItem = new Map(entries.map((e) => [e.itemId, e]));
  const photoIdsOf = (itemId: number | null) => photos.filter((p) => p.itemId === itemId).map((p) => p.id);
  return {
    kind: 'battery',
    lab: sharedLab(await getLabSettings(deps.models)),
    expiresAt: link.expiresAt,
    includePrices: link.includePrices,
    battery: sharedBattery(toApiBattery(row), link.includePrices),
    runs: runs
      .filter((run) => run.summary !== null)
      .map((run) => ({
        name: run.name,
        kind: run.kind,
        startedAt: run.startedAt,
        capacityAh: run.summary!.capacityAh,
        capacityWh: run.summary!.capacityWh,
        percentRatedAh: run.summary!.percentRatedAh,
        verdict: run.summary!.verdict,
        protectionTrips: run.summary!.protectionTrips,
        protections: run.summary!.protections ?? [],
      })),
    inspection: items
      .filter((item) => byItem.has(item.id) || photoIdsOf(item.id).length > 0)
      .map((item) => ({
        item: { id: item.id, title: item.title },
        rating: byItem.get(item.id)?.rating ?? null,
        note: byItem.get(item.id)?.note ?? null,
        photoIds: photoIdsOf(item.id),
      })),
    otherPhotoIds: photoIdsOf(null),
  };
}
