import type { Frame } from '../schemas/frame.js';
import type { CalibrationState, ChannelCorrections } from '../schemas/instrument.js';

/** Aux channel that keeps a corrected channel's raw value: `raw_volts`, `raw_amps`, `raw_temp_cell`. */
export function rawChannelName(channel: string): string {
  return `raw_${channel.replace(':', '_')}`;
}

/** In date until the end of the due day; past it, overdue; without a due date, not recorded. Dates are YYYY-MM-DD. */
export function calibrationState(dueOn: string | null, today: string): CalibrationState {
  if (!dueOn) return 'not-recorded';
  return today > dueOn ? 'overdue' : 'in-date';
}

/**
 * Applies a meter's calibration to a frame: corrected = raw × gain + offset for each channel
 * it names (common practice for a linear two-point calibration). The raw value of every
 * channel it changes is kept as an aux channel (`raw_volts`, …) so the archive and the export
 * carry both. Channels the frame lacks are skipped; an identity correction changes nothing.
 */
export function correctFrame(frame: Frame, channels: ChannelCorrections): Frame {
  let out: Frame | undefined;
  const raw: Record<string, number> = {};
  for (const [channel, { gain, offset }] of Object.entries(channels)) {
    if (gain === 1 && offset === 0) continue;
    const value = channel === 'volts' ? frame.volts : channel === 'amps' ? frame.amps : frame.temps?.[channel.slice('temp:'.length)];
    if (value === undefined) continue;
    const corrected = value * gain + offset;
    out ??= { ...frame, ...(frame.temps && { temps: { ...frame.temps } }) };
    if (channel === 'volts') out.volts = corrected;
    else if (channel === 'amps') out.amps = corrected;
    else out.temps![channel.slice('temp:'.length)] = corrected;
    raw[rawChannelName(channel)] = value;
  }
  if (!out) return frame;
  out.aux = { ...frame.aux, ...raw };
  return out;
}
