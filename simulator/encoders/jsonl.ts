import type { Frame } from '../../shared/schemas/frame.js';
import type { LineEncoder } from './csv.js';

/**
 * Creates a JSON-lines encoder: one Frame object per line, in the shape of
 * shared/schemas/frame.ts, with clock 'device' since the meter stamps its own time.
 */
export function createJsonlEncoder(): LineEncoder {
  return {
    header: () => undefined,
    encode(frame: Frame) {
      const ordered = {
        t: frame.t,
        volts: frame.volts,
        amps: frame.amps,
        ...(frame.temps ? { temps: frame.temps } : {}),
        ...(frame.aux ? { aux: frame.aux } : {}),
        clock: 'device',
        ...(frame.seq !== undefined ? { seq: frame.seq } : {}),
      };
      return `${JSON.stringify(ordered)}\n`;
    },
  };
}
