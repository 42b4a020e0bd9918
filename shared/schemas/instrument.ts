import { z } from 'zod';

/**
 * A lab instrument's record (meter, electronic load, supply or charger): what it is, when it
 * was calibrated and is due again, its certificate, and the per-channel gain and offset its
 * calibration found. A meter's corrections apply to readings as they arrive:
 * corrected = raw × gain + offset.
 */

/** What the instrument is on the bench. */
export const InstrumentKindSchema = z.enum(['meter', 'load', 'supply']);
/** Calibration state on a given day: in date, past its due date, or no due date recorded. */
export const CalibrationStateSchema = z.enum(['in-date', 'overdue', 'not-recorded']);

/** Gains outside this range are a typing mistake, not a calibration (common practice: within a few per cent of 1). */
export const MIN_GAIN = 0.5;
export const MAX_GAIN = 2;
/** Largest offset accepted, in the channel's unit (V, A, °C). */
export const MAX_ABS_OFFSET = 1000;
/** Channels a correction can name: volts, amps, or a temperature channel `temp:<name>`. */
export const CORRECTION_CHANNEL_PATTERN = /^(volts|amps|temp:[A-Za-z0-9_-]{1,32})$/;

const isoDate = () =>
  z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'a date such as 2026-11-30').refine((d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)), 'not a real date');
const text = (max: number) => z.string().trim().min(1).max(max);

/** One channel's linear correction. */
export const ChannelCorrectionSchema = z.object({
  gain: z.number().finite().min(MIN_GAIN).max(MAX_GAIN),
  offset: z.number().finite().min(-MAX_ABS_OFFSET).max(MAX_ABS_OFFSET),
});

/** Channel name → correction. */
export const ChannelCorrectionsSchema = z.record(
  z.string().regex(CORRECTION_CHANNEL_PATTERN, 'volts, amps or temp:<channel>'),
  ChannelCorrectionSchema,
);

/** What an admin sends to create or replace a record. */
export const InstrumentInputSchema = z
  .object({
    kind: InstrumentKindSchema,
    make: text(120),
    model: text(120),
    serialNumber: text(80),
    calibratedOn: isoDate().nullable().default(null),
    calibrationDueOn: isoDate().nullable().default(null),
    /** The bench the instrument sits on; null = on the shelf. */
    benchId: z.number().int().positive().nullable().default(null),
    channels: ChannelCorrectionsSchema.default({}),
    notes: z.string().max(2000).default(''),
  })
  .refine((i) => !i.calibratedOn || !i.calibrationDueOn || i.calibrationDueOn >= i.calibratedOn, {
    message: 'the due date cannot be before the calibration date',
    path: ['calibrationDueOn'],
  });

/** The calibration certificate's file, as stored. */
export const CertificateSchema = z.object({
  fileName: z.string(),
  contentType: z.string(),
  sizeBytes: z.number().int().nonnegative(),
  uploadedAt: z.string(),
});

/** A stored record, with its calibration state today. */
export const InstrumentSchema = z.object({
  id: z.number().int().positive(),
  kind: InstrumentKindSchema,
  make: z.string(),
  model: z.string(),
  serialNumber: z.string(),
  calibratedOn: z.string().nullable(),
  calibrationDueOn: z.string().nullable(),
  benchId: z.number().int().positive().nullable(),
  channels: ChannelCorrectionsSchema,
  notes: z.string(),
  certificate: CertificateSchema.nullable(),
  calibration: CalibrationStateSchema,
  updatedAt: z.string(),
});

/** An instrument as a run used it: the record's facts and calibration state when the run started. */
export const RunInstrumentSchema = z.object({
  instrumentId: z.number().int().positive(),
  kind: InstrumentKindSchema,
  make: z.string(),
  model: z.string(),
  serialNumber: z.string(),
  calibratedOn: z.string().nullable(),
  calibrationDueOn: z.string().nullable(),
  calibration: CalibrationStateSchema,
  channels: ChannelCorrectionsSchema,
});

export type InstrumentKind = z.infer<typeof InstrumentKindSchema>;
export type CalibrationState = z.infer<typeof CalibrationStateSchema>;
export type ChannelCorrection = z.infer<typeof ChannelCorrectionSchema>;
export type ChannelCorrections = z.infer<typeof ChannelCorrectionsSchema>;
export type InstrumentInput = z.infer<typeof InstrumentInputSchema>;
export type Instrument = z.infer<typeof InstrumentSchema>;
export type RunInstrument = z.infer<typeof RunInstrumentSchema>;
