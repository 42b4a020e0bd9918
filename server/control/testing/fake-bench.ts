import { createRunPipeline, type RunPipeline } from '../../../shared/measure/run-pipeline.js';
import type { Reading } from '../../../shared/schemas/reading.js';
import type { FakeInstrument } from './fake-instrument.js';
import { SECONDS_PER_HOUR } from '../../../shared/units/time.js';

/** A made-up pack for tests: open-circuit volts linear in state of charge, one series resistance. */
export interface FakePackSpec {
  emptyVolts: number;
  fullVolts: number;
  capacityAh: number;
  resistanceOhms: number;
  startSoc: number;
  tempCelsius: number;
}


/**
 * A pack wired to a fake load and a fake supply: each `step(dt)` works out the current the
 * instruments' set points draw or push, moves the state of charge by Coulomb counting, and
 * returns the run's reading through the measurement core (so the totals are the run's own).
 * Its own truth (`truthAh`) is the exact charge moved, for the tests to compare against.
 */
export class FakeBench {
  soc: number;
  tempCelsius: number;
  /** Ah out (positive) minus Ah in, counted exactly by the model. */
  truthDischargeAh = 0;
  truthChargeAh = 0;
  private t = 0;
  private readonly pipeline: RunPipeline;

  constructor(
    readonly pack: FakePackSpec,
    readonly load: FakeInstrument,
    readonly supply: FakeInstrument,
  ) {
    this.soc = pack.startSoc;
    this.tempCelsius = pack.tempCelsius;
    this.pipeline = createRunPipeline({ chemistry: 'lfp', cellsInSeries: 8, ratedAh: pack.capacityAh });
  }

  /** Open-circuit volts now. */
  ocv(): number {
    return this.pack.emptyVolts + (this.pack.fullVolts - this.pack.emptyVolts) * this.soc;
  }

  /** Amps now, positive = discharge. */
  amps(): number {
    const ocv = this.ocv();
    const r = this.pack.resistanceOhms;
    let amps = 0;
    const lp = this.load.point;
    if (this.load.outputOn && lp) {
      if (lp.mode === 'cc') amps += lp.value;
      else if (lp.mode === 'cr') amps += ocv / (lp.value + r);
      else if (lp.mode === 'cp') amps += lp.value / ocv;
    }
    const sp = this.supply.point;
    if (this.supply.outputOn && sp && sp.mode === 'cv') amps -= Math.max(0, Math.min(sp.currentLimitAmps ?? Infinity, (sp.value - ocv) / r));
    return amps;
  }

  /** Moves the model on by `dtSeconds` at the current now and returns the run's reading at the new time. */
  step(dtSeconds: number): Reading {
    this.load.checkWatchdog();
    this.supply.checkWatchdog();
    const amps = this.amps();
    const ah = (amps * dtSeconds) / SECONDS_PER_HOUR;
    if (ah > 0) this.truthDischargeAh += ah;
    else this.truthChargeAh -= ah;
    this.soc -= ah / this.pack.capacityAh;
    this.t += dtSeconds;
    return this.read();
  }

  /** The reading at the present instant (no time passes). */
  read(): Reading {
    const amps = this.amps();
    const volts = this.ocv() - amps * this.pack.resistanceOhms;
    this.load.terminals = { volts, amps: Math.max(0, amps) };
    this.supply.terminals = { volts, amps: Math.max(0, -amps) };
    const { reading } = this.pipeline.push({ t: this.t, volts, amps, temps: { cell: this.tempCelsius }, clock: 'device' });
    if (!reading) throw new Error('the measurement core refused a fake reading');
    return reading;
  }
}
