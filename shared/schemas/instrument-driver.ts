import { z } from 'zod';
import { RegisterSpecSchema } from './bench.js';

/**
 * How the server talks to a controllable instrument (an electronic load, a supply or charger):
 * the port, and either a SCPI command set or a Modbus RTU register map. Templates carry
 * `{value}` where the number goes. Defaults are the simulator's own instruments (see
 * simulator/README.md, "Instruments"); a real instrument's manual gives its own words.
 */

/** Where `{value}` goes in a command template. */
export const VALUE_PLACEHOLDER = '{value}';
/** The longest reply time an instrument is allowed (ms). */
export const MAX_REPLY_TIMEOUT_MS = 10_000;
/** IEEE 488.2 error queue: drained at most this many entries at a time (so a stuck queue cannot loop for ever). */
export const MAX_ERROR_QUEUE_READS = 32;

const command = z.string().min(1).max(96).regex(/^[\x20-\x7e]+$/, 'printable ASCII only');
const template = command.refine((t) => t.includes(VALUE_PLACEHOLDER), `must contain ${VALUE_PLACEHOLDER}`);

/** The regulation modes of the control contract (server/control/instrument-control.ts). */
export const ControlModeSchema = z.enum(['cc', 'cp', 'cr', 'cv']);
/** Load (sinks current) or supply/charger (sources it). */
export const InstrumentRoleSchema = z.enum(['load', 'supply']);

/** The serial line an instrument sits on. */
export const InstrumentPortSchema = z.object({
  path: z.string().min(1).max(256),
  baudRate: z.number().int().min(300).max(4_000_000).default(115200),
  dataBits: z.union([z.literal(7), z.literal(8)]).default(8),
  parity: z.enum(['none', 'even', 'odd']).default('none'),
  stopBits: z.union([z.literal(1), z.literal(2)]).default(1),
});

/** Per mode: the largest set point the instrument (or the lab) allows; a larger one is refused before it is sent. */
export const SetPointLimitsSchema = z.object({
  cc: z.number().finite().positive().optional(),
  cp: z.number().finite().positive().optional(),
  cr: z.number().finite().positive().optional(),
  cv: z.number().finite().positive().optional(),
});

/** A SCPI instrument's words for each action of the control contract. */
export const ScpiCommandSetSchema = z.object({
  identify: command.default('*IDN?'),
  reset: command.default('*RST'),
  errorQuery: command.default('SYST:ERR?'),
  /** Selects a mode; a mode without an entry is one the instrument does not have. */
  mode: z.object({ cc: command.optional(), cp: command.optional(), cr: command.optional(), cv: command.optional() }),
  /** Sets the value of a mode, e.g. `CURR {value}`. */
  setValue: z.object({ cc: template.optional(), cp: template.optional(), cr: template.optional(), cv: template.optional() }),
  /** A supply's current limit in CV (CC-CV charging). */
  currentLimit: template.optional(),
  outputOn: command,
  outputOff: command,
  readVolts: command.default('MEAS:VOLT?'),
  readAmps: command.default('MEAS:CURR?'),
  /** Reply `1`/`0` or `ON`/`OFF`. */
  readOutput: command,
  /** Arms the instrument's own watchdog, `{value}` in seconds; absent when it has none. */
  watchdog: template.optional(),
  /**
   * After a command that has no reply, ask the error queue: every command then gets an answer
   * (a silent instrument is caught at once) and a refused command fails at once.
   */
  verifyWithErrorQuery: z.boolean().default(true),
});

/** A controllable instrument on SCPI over serial. */
export const ScpiInstrumentDriverSchema = z.object({
  protocol: z.literal('scpi'),
  id: z.string().min(1).max(64),
  role: InstrumentRoleSchema,
  port: InstrumentPortSchema,
  commands: ScpiCommandSetSchema,
  replyTimeoutMs: z.number().int().min(10).max(MAX_REPLY_TIMEOUT_MS).default(500),
  lineEnding: z.enum(['\n', '\r\n']).default('\n'),
  limits: SetPointLimitsSchema.default({}),
});

/** A register written with a code per mode (e.g. 0 = CC, 1 = CP, …). */
export const ModeRegisterSchema = RegisterSpecSchema.extend({
  codes: z.object({ cc: z.number().int().optional(), cp: z.number().int().optional(), cr: z.number().int().optional(), cv: z.number().int().optional() }),
});

/** A Modbus RTU instrument's holding registers for each action of the control contract. */
export const InstrumentRegisterMapSchema = z.object({
  mode: ModeRegisterSchema,
  setValue: z.object({
    cc: RegisterSpecSchema.optional(),
    cp: RegisterSpecSchema.optional(),
    cr: RegisterSpecSchema.optional(),
    cv: RegisterSpecSchema.optional(),
  }),
  currentLimit: RegisterSpecSchema.optional(),
  /** Written 1 (on) or 0 (off); read back for the state. */
  output: RegisterSpecSchema,
  volts: RegisterSpecSchema,
  amps: RegisterSpecSchema,
  /** Seconds without a request after which the instrument switches off by itself (0 = disarmed). */
  watchdog: RegisterSpecSchema.optional(),
  /** Writing `value` here returns the instrument to its power-on state. */
  reset: z.object({ address: z.number().int().min(0).max(65535), value: z.number().int().min(0).max(65535) }).optional(),
  /** The instrument's last error code (0 = none); reading it clears it. */
  errorCode: RegisterSpecSchema.optional(),
  /** Make, model, serial and firmware as ASCII, two characters a register, NUL padded. */
  identity: z.object({ address: z.number().int().min(0).max(65535), count: z.number().int().min(1).max(64) }).optional(),
});

/** A controllable instrument on Modbus RTU over serial. */
export const ModbusInstrumentDriverSchema = z.object({
  protocol: z.literal('modbus'),
  id: z.string().min(1).max(64),
  role: InstrumentRoleSchema,
  port: InstrumentPortSchema,
  unitId: z.number().int().min(1).max(247).default(1),
  registers: InstrumentRegisterMapSchema,
  replyTimeoutMs: z.number().int().min(10).max(MAX_REPLY_TIMEOUT_MS).default(500),
  limits: SetPointLimitsSchema.default({}),
});

/** Any controllable instrument's driver settings. */
export const InstrumentDriverSchema = z.discriminatedUnion('protocol', [ScpiInstrumentDriverSchema, ModbusInstrumentDriverSchema]);

export type ScpiCommandSet = z.infer<typeof ScpiCommandSetSchema>;
export type ScpiInstrumentDriver = z.infer<typeof ScpiInstrumentDriverSchema>;
export type InstrumentRegisterMap = z.infer<typeof InstrumentRegisterMapSchema>;
export type ModbusInstrumentDriver = z.infer<typeof ModbusInstrumentDriverSchema>;
export type InstrumentDriver = z.infer<typeof InstrumentDriverSchema>;
export type InstrumentDriverInput = z.input<typeof InstrumentDriverSchema>;
