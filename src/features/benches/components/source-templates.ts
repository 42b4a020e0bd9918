import type { SerialFormat } from '../../../../shared/schemas/bench';

/** Simulator scenarios shipped with Kneepoint, offered as suggestions (the server checks the name). */
export const SCENARIO_SUGGESTIONS = [
  'lfp-12v-100ah-cp-cutoff',
  'lfp-48v-30ah-pwm-heater',
  'lfp-12v-hot-cutoff',
  'lfp-12v-weak-cell',
  'lead-acid-12v-reserve',
  'noisy-meter-unplug',
  'check-cold-charge',
  'check-hot-discharge',
  'check-hot-charge',
  'check-electrical-discharge',
  'check-high-voltage',
] as const;

/** A starting point for each serial format; the admin edits it as JSON. */
export const FORMAT_TEMPLATES: Record<SerialFormat['kind'], object> = {
  csv: { kind: 'csv', columns: ['t', 'volts', 'amps', 'temp:cell'], delimiter: ',', header: 'auto', timeUnit: 's', voltsUnit: 'V', ampsUnit: 'A', tempUnit: 'C', currentSign: 'discharge-positive' },
  jsonl: { kind: 'jsonl', fields: { t: 't', volts: 'volts', amps: 'amps', seq: 'seq' }, temps: { cell: 'temp' }, currentSign: 'discharge-positive' },
  scpi: { kind: 'scpi', queries: { volts: 'MEAS:VOLT?', amps: 'MEAS:CURR?', temps: {} }, pollMs: 1000, replyTimeoutMs: 500, lineEnding: '\n', currentSign: 'discharge-positive' },
  modbus: {
    kind: 'modbus',
    unitId: 1,
    pollMs: 1000,
    replyTimeoutMs: 500,
    registers: { volts: { address: 0, type: 'u16', scale: 0.01 }, amps: { address: 1, type: 'i16', scale: 0.01 }, temps: {}, aux: {} },
    currentSign: 'discharge-positive',
  },
};
