import { z } from 'zod';
import { createCsvEncoder, CsvOptionsSchema, type CsvOptionsInput, type LineEncoder } from '../encoders/csv.js';
import { corruptBytes, corruptLine } from '../encoders/corrupt.js';
import { createJsonlEncoder } from '../encoders/jsonl.js';
import { createModbusSlave } from '../encoders/modbus/slave.js';
import { DEFAULT_REGISTER_MAP, RegisterMapSchema, type RegisterMapInput } from '../encoders/modbus/register-map.js';
import { createScpiInstrument, DEFAULT_IDN } from '../encoders/scpi.js';
import type { SimReading } from '../engine/simulation.js';
import { createPrng } from '../prng.js';
import type { MeterConfig, Scenario } from '../scenario/schema.js';

export const MeterFormatSchema = z.enum(['csv', 'jsonl', 'scpi', 'modbus']);
export type MeterFormat = z.infer<typeof MeterFormatSchema>;

export interface MeterDeviceOptions {
  format: MeterFormat;
  meter: MeterConfig;
  seed: number;
  csv?: CsvOptionsInput;
  scpi?: { idn?: string };
  modbus?: { unitId?: number; map?: RegisterMapInput };
}

/** The bytes side of a simulated meter: what it sends on its own and what it answers. */
export interface MeterDevice {
  readonly format: MeterFormat;
  /** Bytes the meter pushes for a new reading (streaming formats; a header after power-up). */
  sample(reading: SimReading): Uint8Array[];
  /** Replies to bytes from the master (query formats); streaming meters ignore input. */
  receive(bytes: Uint8Array): Uint8Array[];
}

const text = new TextEncoder();
const decoder = new TextDecoder();

/** CSV options for a scenario: the default columns, plus the heater current when the pack has a pad. */
export function csvOptionsFor(scenario: Scenario, withTime = true): CsvOptionsInput {
  const columns = CsvOptionsSchema.parse({}).columns.filter((c) => withTime || c.field !== 't');
  if (scenario.pack.heater) columns.push({ field: 'aux:heaterAmps', unit: 'A', decimals: 3 });
  return { columns };
}

/** Creates a meter device for one of the four wire formats. */
export function createMeterDevice(options: MeterDeviceOptions): MeterDevice {
  const wire = createPrng(options.seed, `wire:${options.format}`);
  if (options.format === 'csv' || options.format === 'jsonl') {
    const encoder = options.format === 'csv' ? createCsvEncoder(options.csv) : createJsonlEncoder();
    return streamingDevice(options.format, encoder, wire);
  }
  // A query meter fails per reply: no answer (the master times out) or a damaged one.
  const damage = (reply: Uint8Array, binary: boolean): Uint8Array | undefined => {
    if (wire.next() < options.meter.dropProbability) return undefined;
    if (wire.next() >= options.meter.corruptProbability) return reply;
    return binary ? corruptBytes(reply, wire) : text.encode(corruptLine(decoder.decode(reply), wire));
  };
  const keep = (r: Uint8Array | undefined): r is Uint8Array => r !== undefined;
  if (options.format === 'scpi') {
    const instrument = createScpiInstrument(options.scpi?.idn ?? DEFAULT_IDN);
    return {
      format: 'scpi',
      sample(s) {
        if (s.plugged) instrument.update(s.frame);
        return [];
      },
      receive: (bytes) => instrument.receive(decoder.decode(bytes)).map((r) => damage(text.encode(r), false)).filter(keep),
    };
  }
  const map = options.modbus?.map ? RegisterMapSchema.parse(options.modbus.map) : DEFAULT_REGISTER_MAP;
  const slave = createModbusSlave(options.modbus?.unitId ?? 1, map);
  return {
    format: 'modbus',
    sample(s) {
      if (s.plugged) slave.update(s.frame);
      return [];
    },
    receive: (bytes) => slave.receive(bytes).map((r) => damage(r, true)).filter(keep),
  };
}

function streamingDevice(format: MeterFormat, encoder: LineEncoder, wire: ReturnType<typeof createPrng>): MeterDevice {
  let poweredUp = false;
  return {
    format,
    sample(s) {
      if (!s.plugged) {
        poweredUp = false;
        return [];
      }
      const out: Uint8Array[] = [];
      // A USB-powered meter restarts on replug and prints its header again.
      const header = poweredUp ? undefined : encoder.header();
      poweredUp = true;
      if (header) out.push(text.encode(header));
      if (s.lost) return out;
      const line = encoder.encode(s.frame);
      out.push(text.encode(s.corrupt ? corruptLine(line, wire) : line));
      return out;
    },
    receive: () => [],
  };
}
