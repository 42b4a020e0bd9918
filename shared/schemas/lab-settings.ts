import { z } from 'zod';
import { labelText } from './text.js';
import { CHEMISTRIES, type Chemistry } from './battery.js';

/**
 * Default end-of-discharge voltage per cell by chemistry. Common practice, from memory
 * (cell makers' datasheets usually list these or slightly lower): LFP 2.5 V, NMC/NCA/LCO/LMO
 * 3.0 V, LTO 1.8 V, lead-acid 1.75 V at low rates, NiMH 1.0 V.
 */
export const DEFAULT_END_VOLTS_PER_CELL: Record<Chemistry, number> = {
  lfp: 2.5,
  nmc: 3.0,
  nca: 3.0,
  lco: 3.0,
  lmo: 3.0,
  lto: 1.8,
  'lead-acid': 1.75,
  nimh: 1.0,
};

/** Default share of rated capacity a pack must deliver to pass (a lab choice, common practice). */
export const DEFAULT_ACCEPTANCE_PERCENT = 95;

const MAX_END_VOLTS_PER_CELL = 5;

function isTimeZone(zone: string): boolean {
  try {
    new Intl.DateTimeFormat('en', { timeZone: zone });
    return true;
  } catch {
    return false;
  }
}

const endVoltsShape = Object.fromEntries(
  CHEMISTRIES.map((chemistry) => [
    chemistry,
    z.number().positive().max(MAX_END_VOLTS_PER_CELL).default(DEFAULT_END_VOLTS_PER_CELL[chemistry]),
  ]),
) as Record<Chemistry, z.ZodDefault<z.ZodNumber>>;

const EndVoltsPerCellSchema = z.object(endVoltsShape);

/** Lab-wide settings (admin writes, everyone reads). Missing keys take their defaults. */
export const LabSettingsSchema = z.object({
  labName: labelText(120).default('My lab'),
  endVoltsPerCell: EndVoltsPerCellSchema.prefault({}),
  acceptancePercent: z.number().min(1).max(100).default(DEFAULT_ACCEPTANCE_PERCENT),
  temperatureUnit: z.enum(['C', 'F']).default('C'),
  energyUnit: z.enum(['Wh', 'kWh']).default('Wh'),
  timeZone: z.string().refine(isTimeZone, 'Unknown IANA time zone').default('UTC'),
  /** The lab's currency (ISO 4217) for prices of packs that do not name their own. */
  currency: z.string().regex(/^[A-Z]{3}$/, 'ISO 4217 code such as EUR').default('EUR'),
});
export type LabSettings = z.infer<typeof LabSettingsSchema>;

/**
 * PUT /api/settings body: the whole document, strictly checked at every level (an unknown
 * key, nested ones included, is refused rather than dropped; defaults fill the gaps).
 */
export const LabSettingsInputSchema = LabSettingsSchema.extend({ endVoltsPerCell: EndVoltsPerCellSchema.strict().prefault({}) }).strict();
