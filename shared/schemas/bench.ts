import { z } from 'zod';
import { labelText, noteText } from './text.js';
import { MeterAccuracySchema } from './meter-accuracy.js';
import { MS_PER_S } from '../units/time.js';

/**
 * Benches and their sources: the one source of truth for the server's bench manager,
 * the `/api/benches` routes and the client's bench forms.
 *
 * Sign convention (see frame.ts): positive amps = discharge. A meter that reports the
 * opposite sign is configured with `currentSign: 'discharge-negative'` and the parser flips it.
 */

/** Longest text we accept in names and free-text fields; keeps rows and logs bounded. */
const NAME_MAX_CHARS = 80;
const NOTES_MAX_CHARS = 2000;
/** Polling faster than this floods a serial line (a 9600-baud line carries ~960 bytes/s). */
export const MIN_POLL_MS = 20;
export const MAX_POLL_MS = 60_000;
/** Default no-data watchdog: a source is "stale" after this long without a valid frame. */
export const DEFAULT_STALE_AFTER_S = 10;

/**
 * Physical bounds of a bench's meter values: a frame outside them is no measurement (a
 * garbled line, a wrong unit, a meter fault) and is counted as a bad frame with its reason
 * instead of reaching a run. Defaults are well beyond any battery bench (a 1,500 V DC
 * string, a 5 kA starter test) yet far inside what would break a figure.
 */
export const DEFAULT_MAX_ABS_VOLTS = 2000;
export const DEFAULT_MAX_ABS_AMPS = 5000;
export const DEFAULT_MIN_TEMP_CELSIUS = -100;
export const DEFAULT_MAX_TEMP_CELSIUS = 300;
/** The widest bounds a bench may set (the measurement core refuses beyond 1e9 on its own). */
const LIMIT_CEILING = 1e6;

export const FrameLimitsSchema = z
  .object({
    maxAbsVolts: z.number().finite().positive().max(LIMIT_CEILING).default(DEFAULT_MAX_ABS_VOLTS),
    maxAbsAmps: z.number().finite().positive().max(LIMIT_CEILING).default(DEFAULT_MAX_ABS_AMPS),
    minTempCelsius: z.number().finite().min(-LIMIT_CEILING).default(DEFAULT_MIN_TEMP_CELSIUS),
    maxTempCelsius: z.number().finite().max(LIMIT_CEILING).default(DEFAULT_MAX_TEMP_CELSIUS),
  })
  .refine((l) => l.minTempCelsius < l.maxTempCelsius, { message: 'minTempCelsius must be below maxTempCelsius', path: ['minTempCelsius'] });

export const CurrentSignSchema = z.enum(['discharge-positive', 'discharge-negative']);
export const TimeUnitSchema = z.enum(['s', 'ms', 'iso']);
export const VoltsUnitSchema = z.enum(['V', 'mV']);
export const AmpsUnitSchema = z.enum(['A', 'mA']);
export const TempUnitSchema = z.enum(['C', 'F', 'K']);

/**
 * A CSV column names what it carries: `t`, `seq`, `volts`, `amps`, `temp:<channel>`
 * (°C after unit conversion), `aux:<name>` (for example `aux:heaterAmps`), or `-` to skip.
 */
export const CsvColumnSchema = z
  .string()
  .regex(/^(t|seq|volts|amps|-|temp:[A-Za-z0-9_]{1,32}|aux:[A-Za-z0-9_]{1,32})$/, {
    message: "column must be t, seq, volts, amps, '-', temp:<channel> or aux:<name>",
  });

/** Units shared by the text formats (CSV and JSON lines). */
const UnitsShape = {
  timeUnit: TimeUnitSchema.default('s'),
  voltsUnit: VoltsUnitSchema.default('V'),
  ampsUnit: AmpsUnitSchema.default('A'),
  tempUnit: TempUnitSchema.default('C'),
  currentSign: CurrentSignSchema.default('discharge-positive'),
};

/** Delimited text lines; without a `t` column each frame is stamped on arrival. */
export const CsvFormatSchema = z
  .object({
    kind: z.literal('csv'),
    columns: z.array(CsvColumnSchema).min(2).max(32),
    delimiter: z.enum([',', ';', '\t', ' ']).default(','),
    /** `auto`: a line whose first field is not a number is taken as a header and skipped. */
    header: z.enum(['none', 'skip-first', 'auto']).default('auto'),
    ...UnitsShape,
  })
  .refine((f) => f.columns.includes('volts') && f.columns.includes('amps'), {
    message: 'columns must include volts and amps',
    path: ['columns'],
  });

/**
 * JSON lines: one object per line. `fields` maps Frame keys to the object's keys;
 * `temps`/`aux` map channel names to keys. A nested `temps`/`aux` object in the line is
 * also taken as is (in °C) when no mapping is given.
 */
export const JsonlFormatSchema = z.object({
  kind: z.literal('jsonl'),
  fields: z
    .object({
      t: z.string().min(1).max(64).default('t'),
      volts: z.string().min(1).max(64).default('volts'),
      amps: z.string().min(1).max(64).default('amps'),
      seq: z.string().min(1).max(64).default('seq'),
    })
    .prefault({}),
  temps: z.record(z.string().max(32), z.string().max(64)).optional(),
  aux: z.record(z.string().max(32), z.string().max(64)).optional(),
  ...UnitsShape,
});

/** SCPI query strings; each reply is one number (optionally followed by a unit). */
export const ScpiFormatSchema = z.object({
  kind: z.literal('scpi'),
  queries: z.object({
    volts: z.string().min(1).max(64).default('MEAS:VOLT?'),
    amps: z.string().min(1).max(64).default('MEAS:CURR?'),
    /** Channel name → query, e.g. `{ cell: 'MEAS:TEMP?' }` (a query of our own naming). */
    temps: z.record(z.string().max(32), z.string().min(1).max(64)).default({}),
  }).prefault({}),
  idnQuery: z.string().max(64).default('*IDN?'),
  pollMs: z.number().int().min(MIN_POLL_MS).max(MAX_POLL_MS).default(1000),
  replyTimeoutMs: z.number().int().min(10).max(10_000).default(500),
  lineEnding: z.enum(['\n', '\r\n']).default('\n'),
  currentSign: CurrentSignSchema.default('discharge-positive'),
});

export const RegisterTypeSchema = z.enum(['u16', 'i16', 'u32', 'i32', 'f32']);

/** One quantity in holding registers: value = raw × scale + offset. */
export const RegisterSpecSchema = z.object({
  address: z.number().int().min(0).max(65535),
  type: RegisterTypeSchema.default('u16'),
  scale: z.number().finite().default(1),
  offset: z.number().finite().default(0),
  /** 32-bit values: which register holds the high word (Modbus has no standard; common practice is high first). */
  wordOrder: z.enum(['high-first', 'low-first']).default('high-first'),
});

export const ModbusFormatSchema = z.object({
  kind: z.literal('modbus'),
  unitId: z.number().int().min(1).max(247),
  pollMs: z.number().int().min(MIN_POLL_MS).max(MAX_POLL_MS).default(1000),
  replyTimeoutMs: z.number().int().min(10).max(10_000).default(500),
  registers: z.object({
    volts: RegisterSpecSchema,
    amps: RegisterSpecSchema,
    /** The meter's own time in seconds after scaling; without it frames are stamped on arrival. */
    t: RegisterSpecSchema.optional(),
    /** The meter's sample counter, when it keeps one. */
    seq: RegisterSpecSchema.optional(),
    temps: z.record(z.string().max(32), RegisterSpecSchema).default({}),
    aux: z.record(z.string().max(32), RegisterSpecSchema).default({}),
  }),
  currentSign: CurrentSignSchema.default('discharge-positive'),
});

export const SerialFormatSchema = z.discriminatedUnion('kind', [
  CsvFormatSchema,
  JsonlFormatSchema,
  ScpiFormatSchema,
  ModbusFormatSchema,
]);

export const SerialSourceConfigSchema = z.object({
  kind: z.literal('serial'),
  /** Device path, e.g. /dev/ttyUSB0 or a pseudo-terminal link under /tmp. */
  path: z.string().min(1).max(255).regex(/^\//, { message: 'path must be absolute' }),
  baudRate: z.number().int().min(300).max(4_000_000).default(115200),
  dataBits: z.union([z.literal(7), z.literal(8)]).default(8),
  parity: z.enum(['none', 'even', 'odd']).default('none'),
  stopBits: z.union([z.literal(1), z.literal(2)]).default(1),
  staleAfterSeconds: z.number().min(1).max(3600).default(DEFAULT_STALE_AFTER_S),
  format: SerialFormatSchema,
  limits: FrameLimitsSchema.prefault({}),
});

/** Where a simulated bench's load and supply answer: absolute pseudo-terminal link paths. */
export const SimulatedInstrumentLinksSchema = z.object({
  loadLinkPath: z.string().min(1).max(255).regex(/^\//, { message: 'path must be absolute' }),
  supplyLinkPath: z.string().min(1).max(255).regex(/^\//, { message: 'path must be absolute' }),
}).refine((l) => l.loadLinkPath !== l.supplyLinkPath, { message: 'The load and the supply need their own links', path: ['supplyLinkPath'] });
export type SimulatedInstrumentLinks = z.infer<typeof SimulatedInstrumentLinksSchema>;

/** A simulator scenario run in-process (or through a pty with `format`) at `speed`× real time. */
export const SimulatorSourceConfigSchema = z.object({
  kind: z.literal('simulator'),
  scenario: z.string().min(1).max(64).regex(/^[a-z0-9-]+$/, { message: 'scenario is a kebab-case name' }),
  speed: z.number().min(0.1).max(1000).default(1),
  seed: z.number().int().min(0).max(2 ** 31 - 1).default(1),
  /** Absent: frames handed over in-process. Present: bytes through a pseudo-terminal in that format. */
  format: z.enum(['csv', 'jsonl', 'scpi', 'modbus']).optional(),
  staleAfterSeconds: z.number().min(1).max(3600).default(DEFAULT_STALE_AFTER_S),
  limits: FrameLimitsSchema.prefault({}),
  /**
   * The simulated electronic load and supply on this pack, each answering SCPI on a socat
   * pseudo-terminal at its link (under /tmp or .data/); the bench's instruments open these links.
   */
  instruments: SimulatedInstrumentLinksSchema.optional(),
});

export const NoSourceConfigSchema = z.object({ kind: z.literal('none') });

export const BenchSourceConfigSchema = z.discriminatedUnion('kind', [
  SerialSourceConfigSchema,
  SimulatorSourceConfigSchema,
  NoSourceConfigSchema,
]);

export const SourceStateSchema = z.enum(['connected', 'receiving', 'stale', 'reconnecting', 'error', 'idle']);

/** Live status of a bench's source, as reported by the bench manager. */
export const BenchStatusSchema = z.object({
  state: SourceStateSchema,
  message: z.string().optional(),
  /** ISO time the last valid frame arrived (server clock). */
  lastFrameAt: z.string().optional(),
  framesOk: z.number().int().nonnegative(),
  framesRejected: z.number().int().nonnegative(),
  /** The last rejection's reason, for the bench page ("line 12: volts is not a number"). */
  lastRejection: z.string().optional(),
});

/** Largest load threshold a bench may set, A (a threshold is a small current, not a load). */
export const MAX_LOAD_ON_AMPS = 100;
/**
 * A bench's load threshold, A: discharge current at or above it counts as a load (the test
 * starts, means are taken under it). Null: 0.2 A, or C/20 of the pack's rated Ah when lower.
 */
export const LoadOnAmpsSchema = z.number().finite().positive().max(MAX_LOAD_ON_AMPS).nullable();

export const BenchSchema = z.object({
  id: z.number().int().positive(),
  name: z.string(),
  source: BenchSourceConfigSchema,
  enabled: z.boolean(),
  notes: z.string(),
  loadOnAmps: LoadOnAmpsSchema.default(null),
  /** The meter's stated accuracy from its data sheet (null: not stated, no uncertainty is given). */
  meterAccuracy: MeterAccuracySchema.nullable().default(null),
  /** The bench gateway that runs this bench's source on another machine; null: this server. */
  gatewayId: z.number().int().positive().nullable().default(null),
  createdAt: z.string(),
  updatedAt: z.string(),
});

/** A bench as the API returns it: the stored bench and its live status. */
export const BenchWithStatusSchema = BenchSchema.extend({ status: BenchStatusSchema });

export const CreateBenchRequestSchema = z.object({
  name: labelText(NAME_MAX_CHARS),
  source: BenchSourceConfigSchema,
  enabled: z.boolean().default(true),
  notes: noteText(NOTES_MAX_CHARS).default(''),
  loadOnAmps: LoadOnAmpsSchema.default(null),
  meterAccuracy: MeterAccuracySchema.nullable().default(null),
});

export const UpdateBenchRequestSchema = z
  .object({
    name: labelText(NAME_MAX_CHARS),
    source: BenchSourceConfigSchema,
    enabled: z.boolean(),
    notes: noteText(NOTES_MAX_CHARS),
    loadOnAmps: LoadOnAmpsSchema,
    meterAccuracy: MeterAccuracySchema.nullable(),
  })
  .partial();

export const BenchListResponseSchema = z.object({ benches: z.array(BenchWithStatusSchema) });
export const BenchResponseSchema = z.object({ bench: BenchWithStatusSchema });

export const SerialPortInfoSchema = z.object({
  path: z.string(),
  manufacturer: z.string().optional(),
  serialNumber: z.string().optional(),
  vendorId: z.string().optional(),
  productId: z.string().optional(),
});

/** `GET /api/benches/ports`; `message` explains an empty or failed listing (pseudo-terminals are never listed). */
export const SerialPortListResponseSchema = z.object({
  ports: z.array(SerialPortInfoSchema),
  message: z.string().optional(),
});

export type FrameLimits = z.infer<typeof FrameLimitsSchema>;
export type CurrentSign = z.infer<typeof CurrentSignSchema>;
export type CsvFormat = z.infer<typeof CsvFormatSchema>;
export type JsonlFormat = z.infer<typeof JsonlFormatSchema>;
export type ScpiFormat = z.infer<typeof ScpiFormatSchema>;
export type ModbusFormat = z.infer<typeof ModbusFormatSchema>;
export type RegisterSpec = z.infer<typeof RegisterSpecSchema>;
export type SerialFormat = z.infer<typeof SerialFormatSchema>;
export type SerialSourceConfig = z.infer<typeof SerialSourceConfigSchema>;
export type SimulatorSourceConfig = z.infer<typeof SimulatorSourceConfigSchema>;
export type BenchSourceConfig = z.infer<typeof BenchSourceConfigSchema>;
export type BenchSourceConfigInput = z.input<typeof BenchSourceConfigSchema>;
export type SourceState = z.infer<typeof SourceStateSchema>;
export type BenchStatus = z.infer<typeof BenchStatusSchema>;
export type Bench = z.infer<typeof BenchSchema>;
export type BenchWithStatus = z.infer<typeof BenchWithStatusSchema>;
export type CreateBenchRequest = z.input<typeof CreateBenchRequestSchema>;
export type UpdateBenchRequest = z.input<typeof UpdateBenchRequestSchema>;
export type SerialPortInfo = z.infer<typeof SerialPortInfoSchema>;
export type SerialPortListResponse = z.infer<typeof SerialPortListResponseSchema>;


/**
 * The source's own interval between readings, s, when its configuration states one: the
 * poll period of a polled meter (SCPI, Modbus). Null when the device or the simulator sets
 * its own pace; the run's gap limit then falls back to its default.
 */
export function sourceCadenceSeconds(source: BenchSourceConfig): number | null {
  if (source.kind !== 'serial') return null;
  const format = source.format;
  return format.kind === 'scpi' || format.kind === 'modbus' ? format.pollMs / MS_PER_S : null;
}
