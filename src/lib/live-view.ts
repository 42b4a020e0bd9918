import type { BenchStatus } from '../../shared/schemas/bench';
import type { RunEvent } from '../../shared/schemas/run-event';
import type { Run } from '../../shared/schemas/run';

/** The low-rate picture React renders: latest values, totals, events, state. */
export interface LiveView {
  /** The latest reading's time: run time (elapsedSeconds) on a run topic, source time on a bench topic. */
  time: number | null;
  volts: number | null;
  amps: number | null;
  watts: number | null;
  tempCelsius: number | null;
  tempChannel: string | null;
  dischargeWh: number | null;
  dischargeAh: number | null;
  chargeWh: number | null;
  chargeAh: number | null;
  run: Run | null;
  status: BenchStatus | null;
  events: readonly RunEvent[];
  /** Readings the server thinned away for this screen (display only; totals are unaffected). */
  droppedReadings: number;
  /** The server's complaint about this topic (unknown run, not allowed), if any. */
  error: string | null;
  /** Bumped whenever the ring buffer changes, so the chart knows to redraw. */
  dataVersion: number;
  /**
   * When (this browser's clock, ms) the latest live batch arrived. The bench status only
   * moves when its state changes, so "last reading … ago" needs this to stay true.
   */
  receivedAtMs: number | null;
}

/** A topic before its first message. */
export const EMPTY_LIVE_VIEW: LiveView = {
  time: null, volts: null, amps: null, watts: null, tempCelsius: null, tempChannel: null,
  dischargeWh: null, dischargeAh: null, chargeWh: null, chargeAh: null,
  run: null, status: null, events: [], droppedReadings: 0, error: null, dataVersion: 0, receivedAtMs: null,
};

/** Archived history as the readings API answers it: min/max per bucket (equal at full resolution); `x` in run seconds here. */
export interface HistoryColumns {
  x: number[];
  bucketSeconds: number | null;
  volts: MinMax;
  amps: MinMax;
  watts: MinMax;
  temps: Record<string, MinMax>;
}
/** One channel's bucket minima and maxima; null = no reading (a gap). */
export interface MinMax {
  min: (number | null)[];
  max: (number | null)[];
}

/** Temperature channel shown when a reading has several (the cell is what protections watch). */
const PREFERRED_TEMP_CHANNEL = 'cell';

/** The channel a live screen shows: `cell` when present, else the first by name. */
export function pickTempChannel(temps: Record<string, unknown>): string | null {
  const names = Object.keys(temps);
  if (names.length === 0) return null;
  return names.includes(PREFERRED_TEMP_CHANNEL) ? PREFERRED_TEMP_CHANNEL : names.sort()[0];
}
