import { correctFrame } from '../../shared/measure/calibration.js';
import type { Frame } from '../../shared/schemas/frame.js';
import type { ChannelCorrections, Instrument } from '../../shared/schemas/instrument.js';

/**
 * Per-bench calibration of the meters on it, applied to each frame as it is made. Built from
 * the instrument records and rebuilt whenever one changes. A channel named by two meters on
 * one bench takes the lower id's correction (the records page warns about the overlap).
 */
export class FrameCorrector {
  private byBench = new Map<number, ChannelCorrections>();

  /** Replaces the corrections with those of the meters in `instruments`. */
  load(instruments: readonly Instrument[]): void {
    const next = new Map<number, ChannelCorrections>();
    for (const instrument of [...instruments].sort((a, b) => a.id - b.id)) {
      if (instrument.kind !== 'meter' || instrument.benchId === null) continue;
      const channels = next.get(instrument.benchId) ?? {};
      for (const [channel, correction] of Object.entries(instrument.channels)) channels[channel] ??= correction;
      next.set(instrument.benchId, channels);
    }
    this.byBench = next;
  }

  /** The corrected frame (raw values kept as `raw_*` aux channels), or the frame itself when the bench has no correction. */
  apply(benchId: number, frame: Frame): Frame {
    const channels = this.byBench.get(benchId);
    return channels ? correctFrame(frame, channels) : frame;
  }
}
