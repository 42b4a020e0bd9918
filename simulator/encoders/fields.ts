import type { Frame } from '../../shared/schemas/frame.js';

/**
 * A frame field by name: `t`, `volts`, `amps`, `seq`, `temp:<channel>` or `aux:<channel>`.
 * One vocabulary for the CSV columns and the Modbus register map.
 */
export type FieldName = 't' | 'volts' | 'amps' | 'seq' | `temp:${string}` | `aux:${string}`;

export const FIELD_NAME_PATTERN = /^(t|volts|amps|seq|temp:[A-Za-z0-9_]+|aux:[A-Za-z0-9_]+)$/;

/** Reads a field from a frame; undefined when the frame lacks that channel. */
export function fieldValue(frame: Frame, field: FieldName): number | undefined {
  if (field === 't' || field === 'volts' || field === 'amps') return frame[field];
  if (field === 'seq') return frame.seq;
  const [kind, channel] = field.split(':') as ['temp' | 'aux', string];
  return kind === 'temp' ? frame.temps?.[channel] : frame.aux?.[channel];
}
