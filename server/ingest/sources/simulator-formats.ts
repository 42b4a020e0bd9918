import { MAX_POLL_MS, MIN_POLL_MS, SerialFormatSchema, type RegisterSpec, type SerialFormat } from '../../../shared/schemas/bench.js';
import { csvOptionsFor, DEFAULT_REGISTER_MAP, type RegisterMap, type Scenario } from '../../../simulator/index.js';
import { MS_PER_S } from '../../../shared/units/time.js';

/** A reply slower than this from a simulated meter on a local pty means something is wrong. */
const SIMULATED_REPLY_TIMEOUT_MS = 1000;
const TYPE_NAMES = { uint16: 'u16', int16: 'i16', uint32: 'u32', int32: 'i32' } as const;

/**
 * The serial format that reads what the simulator's meter writes in `format`: the CSV
 * columns it prints for this scenario (heater current included when the pack has a pad),
 * its JSON lines, its SCPI queries, or its default Modbus register map. Query meters are
 * polled once per simulated sample.
 */
export function serialFormatForSimulator(format: 'csv' | 'jsonl' | 'scpi' | 'modbus', scenario: Scenario, speed: number): SerialFormat {
  const pollMs = Math.min(MAX_POLL_MS, Math.max(MIN_POLL_MS, Math.round((scenario.meter.readingPeriodSeconds * MS_PER_S) / speed)));
  switch (format) {
    case 'csv':
      return SerialFormatSchema.parse({ kind: 'csv', columns: (csvOptionsFor(scenario).columns ?? []).map((c) => c.field) });
    case 'jsonl':
      return SerialFormatSchema.parse({ kind: 'jsonl' });
    case 'scpi':
      return SerialFormatSchema.parse({
        kind: 'scpi',
        pollMs,
        replyTimeoutMs: SIMULATED_REPLY_TIMEOUT_MS,
        queries: { temps: { cell: 'MEAS:TEMP?', ambient: 'MEAS:TEMP? (@2)' } },
      });
    case 'modbus':
      return SerialFormatSchema.parse({ kind: 'modbus', unitId: 1, pollMs, replyTimeoutMs: SIMULATED_REPLY_TIMEOUT_MS, registers: registersFrom(DEFAULT_REGISTER_MAP) });
  }
}

/** Translates the simulator's register map into a bench register map. */
function registersFrom(map: RegisterMap) {
  const registers: Record<string, unknown> & { temps: Record<string, RegisterSpec>; aux: Record<string, RegisterSpec> } = { temps: {}, aux: {} };
  for (const r of map.registers) {
    const spec = { address: r.address, type: TYPE_NAMES[r.type], scale: r.scale, offset: 0, wordOrder: map.wordOrder };
    const [kind, channel] = r.field.split(':') as [string, string | undefined];
    if (kind === 'temp' && channel) registers.temps[channel] = spec;
    else if (kind === 'aux' && channel) registers.aux[channel] = spec;
    else registers[kind] = spec;
  }
  return registers;
}
