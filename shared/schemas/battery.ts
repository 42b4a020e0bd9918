import { z } from 'zod';
import { PROTECTIONS, ProtectionSpecSchema } from './protection-check.js';

/** Cell chemistries Kneepoint knows end voltages for (trade abbreviations). */
export const CHEMISTRIES = ['lfp', 'nmc', 'nca', 'lco', 'lmo', 'lto', 'lead-acid', 'nimh'] as const;
export const ChemistrySchema = z.enum(CHEMISTRIES);
export type Chemistry = z.infer<typeof ChemistrySchema>;

/** Largest series count we accept (a 1000 V pack of LTO cells is still well under this). */
const MAX_CELLS_IN_SERIES = 600;
const MAX_CELLS_IN_PARALLEL = 500;
/** Longest side we accept for a pack, mm (a 10 m string of racks is still under this). */
const MAX_DIMENSION_MM = 10_000;
/** Stated cycle life above this is not a claim anyone makes for a chemistry we know. */
const MAX_CYCLE_LIFE = 100_000;
/** Longest warranty we accept, months (30 years). */
const MAX_WARRANTY_MONTHS = 360;
/** A calendar date, YYYY-MM-DD (the day the lab received the pack). */
const isoDate = () => z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'a date such as 2026-11-30').refine((d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)), 'not a real date');
const dimensionMm = () => z.number().finite().positive().max(MAX_DIMENSION_MM).nullable().optional();

const optionalText = (max: number) => z.string().trim().max(max).nullable().optional();
const positive = () => z.number().finite().positive();

/** The editable fields, without defaults (so a partial update never resets a field). */
const BatteryFieldsSchema = z.object({
  label: z.string().trim().min(1).max(120),
  brand: z.string().trim().min(1).max(120),
  model: optionalText(120),
  chemistry: ChemistrySchema,
  cellsInSeries: z.number().int().min(1).max(MAX_CELLS_IN_SERIES),
  cellsInParallel: z.number().int().min(1).max(MAX_CELLS_IN_PARALLEL),
  ratedAh: positive(),
  ratedWh: positive().nullable().optional(),
  bmsRatedAmps: positive().nullable().optional(),
  massKg: positive().nullable().optional(),
  price: z.number().finite().nonnegative().nullable().optional(),
  priceCurrency: z.string().regex(/^[A-Z]{3}$/, 'ISO 4217 code such as EUR').nullable().optional(),
  serialNumber: optionalText(120),
  sender: optionalText(200),
  notes: optionalText(4000),
  receivedOn: isoDate().nullable().optional(),
  /** Who owns the pack or asked for the test (the client), when not the sender. */
  owner: optionalText(200),
  lengthMm: dimensionMm(),
  widthMm: dimensionMm(),
  heightMm: dimensionMm(),
  terminalType: optionalText(120),
  statedCycleLife: z.number().int().positive().max(MAX_CYCLE_LIFE).nullable().optional(),
  warrantyMonths: z.number().int().nonnegative().max(MAX_WARRANTY_MONTHS).nullable().optional(),
  /** What the pack's maker states for each protection (threshold in °C, pack V or A; delay; release); one entry per protection. */
  protectionSpecs: z
    .array(ProtectionSpecSchema)
    .max(PROTECTIONS.length)
    .refine((specs) => new Set(specs.map((s) => s.protection)).size === specs.length, { message: 'One entry per protection' })
    .optional(),
});

/** Fields a technician sends to create a battery pack record (a single cell group by default). */
export const BatteryInputSchema = BatteryFieldsSchema.extend({
  cellsInParallel: BatteryFieldsSchema.shape.cellsInParallel.default(1),
});
export type BatteryInput = z.infer<typeof BatteryInputSchema>;

/** PATCH body: any subset of the fields. */
export const BatteryPatchSchema = BatteryFieldsSchema.partial()
  .strict()
  .refine((body) => Object.keys(body).length > 0, { message: 'Nothing to change' });
export type BatteryPatch = z.infer<typeof BatteryPatchSchema>;

/** A battery pack as the API returns it. */
export const BatterySchema = BatteryInputSchema.extend({
  id: z.number().int(),
  model: z.string().nullable(),
  ratedWh: z.number().nullable(),
  bmsRatedAmps: z.number().nullable(),
  massKg: z.number().nullable(),
  price: z.number().nullable(),
  priceCurrency: z.string().nullable(),
  serialNumber: z.string().nullable(),
  sender: z.string().nullable(),
  notes: z.string().nullable(),
  receivedOn: z.string().nullable(),
  owner: z.string().nullable(),
  lengthMm: z.number().nullable(),
  widthMm: z.number().nullable(),
  heightMm: z.number().nullable(),
  terminalType: z.string().nullable(),
  statedCycleLife: z.number().nullable(),
  warrantyMonths: z.number().nullable(),
  protectionSpecs: z.array(ProtectionSpecSchema),
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type Battery = z.infer<typeof BatterySchema>;
