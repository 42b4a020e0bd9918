import type { Clock } from '../engine/clock.js';
import { dischargeAmps } from '../engine/load.js';
import { MS_PER_S, SECONDS_PER_HOUR } from '../../shared/units/time.js';

/** Regulation modes (the same four as the server's control contract). */
export type SimMode = 'cc' | 'cp' | 'cr' | 'cv';
/** How a broken instrument behaves on its port: answers noise, or nothing at all. */
export type SimFault = 'garbage' | 'silent';


/** What a simulated instrument is and can do. */
export interface SimInstrumentSpec {
  role: 'load' | 'supply';
  /** IEEE 488.2 identity: maker, model, serial, firmware (fictional). */
  idn: string;
  modes: readonly SimMode[];
  maxAmps: number;
  maxVolts: number;
}

/** One stretch of constant settings and what flowed through the instrument meanwhile (the truth). */
export interface TruthSegment {
  /** Simulated seconds. */
  fromS: number;
  toS: number;
  mode: SimMode;
  value: number;
  outputOn: boolean;
  /** Through the instrument in its own direction (sunk by a load, sourced by a supply). */
  ah: number;
  wh: number;
}

/** Something the instrument did by itself or was told, for tests to check. */
export interface SimInstrumentEvent {
  /** Wall-clock ms (the instrument's clock). */
  atMs: number;
  /** Simulated seconds at the last physics step. */
  t: number;
  kind: 'output-on' | 'output-off' | 'watchdog-off' | 'reset';
}

/** Power-on settings: CC, nothing set, output off, watchdog disarmed. */
const POWER_ON = { mode: 'cc' as SimMode, values: { cc: 0, cp: 0, cr: 0, cv: 0 } };

/**
 * The state of a simulated electronic load or supply: mode, set values, output, watchdog,
 * and the current it draws from (load) or pushes into (supply) the simulated pack. Its own
 * ledger of Ah and Wh per segment of constant settings is the truth tests compare with.
 */
export class SimInstrument {
  mode: SimMode = POWER_ON.mode;
  readonly values: Record<SimMode, number> = { ...POWER_ON.values };
  private on = false;
  /** Armed watchdog time in seconds; 0 = disarmed. */
  watchdogS = 0;
  fault: SimFault | undefined;
  readonly segments: TruthSegment[] = [];
  readonly events: SimInstrumentEvent[] = [];
  /** Whole-life totals through the instrument, in its own direction. */
  readonly totals = { ah: 0, wh: 0 };
  private demand = 0;
  private lastVolts = 0;
  private lastAmps = 0;
  private t = 0;
  private watchdogTimer: unknown;

  constructor(
    readonly spec: SimInstrumentSpec,
    private readonly clock: Clock,
  ) {
    this.openSegment();
  }

  get outputOn(): boolean {
    return this.on;
  }

  /** Terminal volts the instrument measures. */
  get volts(): number {
    return this.lastVolts;
  }

  /** The instrument's own current, positive in its direction. */
  get amps(): number {
    return this.lastAmps;
  }

  /** Any command arrived: the watchdog starts its time again. */
  touch(): void {
    if (this.watchdogS <= 0) return;
    if (this.watchdogTimer !== undefined) this.clock.clearTimeout(this.watchdogTimer);
    this.watchdogTimer = this.clock.setTimeout(() => this.watchdogTrip(), this.watchdogS * MS_PER_S);
  }

  /** Arms (seconds > 0) or disarms (0) the watchdog. */
  armWatchdog(seconds: number): void {
    this.watchdogS = seconds;
    if (this.watchdogTimer !== undefined) this.clock.clearTimeout(this.watchdogTimer);
    this.watchdogTimer = undefined;
    this.touch();
  }

  setMode(mode: SimMode): void {
    this.mode = mode;
    this.openSegment();
  }

  setValue(mode: SimMode, value: number): void {
    this.values[mode] = value;
    this.openSegment();
  }

  setOutput(on: boolean): void {
    if (on === this.on) return;
    this.on = on;
    this.note(on ? 'output-on' : 'output-off');
    this.openSegment();
  }

  /** `*RST`: power-on settings, output off, watchdog disarmed. */
  reset(): void {
    this.mode = POWER_ON.mode;
    Object.assign(this.values, POWER_ON.values);
    this.on = false;
    this.armWatchdog(0);
    this.note('reset');
    this.openSegment();
  }

  /**
   * Terminal current demanded from a source of `sourceVolts` behind `ohms` (positive =
   * discharge): a load sinks per its mode, a supply charges in CV up to its current setting
   * or in CC up to its voltage setting. Off, or with nothing set, it demands nothing.
   */
  demandAmps(sourceVolts: number, ohms: number): number {
    this.demand = this.on ? this.regulate(sourceVolts, ohms) : 0;
    return this.demand;
  }

  /** The current that really flowed for the last demand (`share` of it), at `volts`, for dtSeconds. */
  record(volts: number, share: number, dtSeconds: number, t: number): void {
    const amps = Math.abs(this.demand * share);
    this.lastVolts = volts;
    this.lastAmps = amps;
    this.t = t;
    const ah = (amps * dtSeconds) / SECONDS_PER_HOUR;
    const wh = (amps * volts * dtSeconds) / SECONDS_PER_HOUR;
    this.totals.ah += ah;
    this.totals.wh += wh;
    const segment = this.segments[this.segments.length - 1];
    segment.ah += ah;
    segment.wh += wh;
    segment.toS = t;
  }

  /** The demand of the last call, in terminal sign. */
  get lastDemand(): number {
    return this.demand;
  }

  private regulate(sourceVolts: number, ohms: number): number {
    const { maxAmps, maxVolts } = this.spec;
    if (sourceVolts <= 0) return 0;
    if (this.spec.role === 'supply') {
      const ceilingVolts = Math.min(this.values.cv > 0 ? this.values.cv : maxVolts, maxVolts);
      const limitAmps = Math.min(this.values.cc > 0 ? this.values.cc : maxAmps, maxAmps);
      if (this.mode === 'cv' && this.values.cv <= 0) return 0;
      if (this.mode === 'cc' && this.values.cc <= 0) return 0;
      return -Math.min(limitAmps, Math.max(0, (ceilingVolts - sourceVolts) / ohms));
    }
    const value = this.values[this.mode];
    if (value <= 0) return 0;
    const amps =
      this.mode === 'cc' ? dischargeAmps({ mode: 'cc', amps: value }, sourceVolts, ohms)
      : this.mode === 'cp' ? dischargeAmps({ mode: 'cp', watts: value }, sourceVolts, ohms)
      : this.mode === 'cr' ? dischargeAmps({ mode: 'cr', ohms: value }, sourceVolts, ohms)
      // CV: the load sinks whatever holds the terminals at the set voltage.
      : Math.max(0, (sourceVolts - value) / ohms);
    return Math.min(amps, maxAmps);
  }

  private watchdogTrip(): void {
    this.watchdogTimer = undefined;
    if (!this.on) return;
    this.on = false;
    this.note('watchdog-off');
    this.openSegment();
  }

  private note(kind: SimInstrumentEvent['kind']): void {
    this.events.push({ atMs: this.clock.nowMs(), t: this.t, kind });
  }

  private openSegment(): void {
    const last = this.segments[this.segments.length - 1];
    const segment = { fromS: this.t, toS: this.t, mode: this.mode, value: this.values[this.mode], outputOn: this.on, ah: 0, wh: 0 };
    // A change with no time passed replaces the empty segment it would leave behind.
    if (last && last.toS === last.fromS && last.ah === 0 && last.fromS === this.t) this.segments[this.segments.length - 1] = segment;
    else this.segments.push(segment);
  }
}
