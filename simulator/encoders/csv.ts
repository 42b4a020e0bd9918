import { z } from 'zod';
import type { Frame } from '../../shared/schemas/frame.js';
import { FIELD_NAME_PATTERN, fieldValue, type FieldName } from './fields.js';
import { celsiusToFahrenheit } from '../../shared/units/convert.js';

/** Units a column may be written in, with the factor from the frame's base unit. */
const UNIT_FACTORS = { s: 1, ms: 1000, min: 1 / 60, V: 1, mV: 1000, A: 1, mA: 1000, C: 1, F: 1 } as const;
type Unit = keyof typeof UNIT_FACTORS;

export const CsvColumnSchema = z.object({
  field: z.string().regex(FIELD_NAME_PATTERN, 'field: t, volts, amps, seq, temp:<channel> or aux:<channel>'),
  unit: z.enum(Object.keys(UNIT_FACTORS) as [Unit, ...Unit[]]).optional(),
  decimals: z.number().int().min(0).max(9).default(3),
  /** Header text; defaults to the field and unit, e.g. `volts_V`. */
  label: z.string().optional(),
});

export const CsvOptionsSchema = z.object({
  columns: z.array(CsvColumnSchema).min(1).default([
    { field: 't', unit: 's', decimals: 1 },
    { field: 'volts', unit: 'V', decimals: 3 },
    { field: 'amps', unit: 'A', decimals: 3 },
    { field: 'temp:cell', unit: 'C', decimals: 1 },
  ]),
  delimiter: z.enum([',', ';', '\t']).default(','),
  header: z.boolean().default(true),
  lineEnding: z.enum(['\n', '\r\n']).default('\r\n'),
});
export type CsvOptions = z.infer<typeof CsvOptionsSchema>;
export type CsvOptionsInput = z.input<typeof CsvOptionsSchema>;

/** A text-line encoder: an optional header sent at power-up and one line per frame. */
export interface LineEncoder {
  header(): string | undefined;
  encode(frame: Frame): string;
}

function convert(value: number, unit: Unit | undefined): number {
  if (unit === 'F') return celsiusToFahrenheit(value);
  return value * (unit ? UNIT_FACTORS[unit] : 1);
}

/** Creates a CSV line encoder; a missing channel is written as an empty cell. */
export function createCsvEncoder(input: CsvOptionsInput = {}): LineEncoder {
  const options = CsvOptionsSchema.parse(input);
  const labels = options.columns.map((c) => c.label ?? (c.unit ? `${c.field.replace(':', '_')}_${c.unit}` : c.field.replace(':', '_')));
  return {
    header: () => (options.header ? labels.join(options.delimiter) + options.lineEnding : undefined),
    encode(frame) {
      const cells = options.columns.map((column) => {
        const value = fieldValue(frame, column.field as FieldName);
        return value === undefined ? '' : convert(value, column.unit).toFixed(column.decimals);
      });
      return cells.join(options.delimiter) + options.lineEnding;
    },
  };
}
