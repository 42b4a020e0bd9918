import { LabSettingsSchema, type LabSettings } from '../../shared/schemas/lab-settings.js';
import { LAB_SETTINGS_ROW_ID } from '../db/models/lab-settings.js';
import type { CoreModels } from '../db/models/index.js';

/**
 * The lab's settings with defaults filled in. Other areas (verdicts, reports) read the end
 * voltages and acceptance percentage from here.
 */
export async function getLabSettings(models: CoreModels): Promise<LabSettings> {
  const row = await models.LabSettings.findByPk(LAB_SETTINGS_ROW_ID);
  const stored: unknown = row ? JSON.parse(row.data) : {};
  // A stored document from an older version may lack keys (defaults fill them) or hold
  // values a newer schema rejects; then fall back to defaults rather than failing every page.
  const parsed = LabSettingsSchema.safeParse(stored);
  return parsed.success ? parsed.data : LabSettingsSchema.parse({});
}

/** Replaces the lab's settings (already validated) and records who changed them. */
export async function saveLabSettings(models: CoreModels, settings: LabSettings, userId: number | null): Promise<LabSettings> {
  await models.LabSettings.upsert({ id: LAB_SETTINGS_ROW_ID, data: JSON.stringify(settings), updatedById: userId });
  return settings;
}
