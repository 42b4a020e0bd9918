import { createBms, type Bms } from '../model/bms.js';
import { createHeater, type HeaterController } from '../model/heater.js';
import type { Pack } from '../model/pack.js';
import { stepTemperature } from '../model/thermal.js';
import type { Prng } from '../prng.js';
import type { Scenario } from '../scenario/schema.js';
import { ambientAt } from './ambient.js';
import { buildPack } from './build-pack.js';
import type { SimEvent, SimTotals } from './events.js';
import type { ExternalDrive } from './external-drive.js';
import { chargeAmps, dischargeAmps } from './load.js';
import { SECONDS_PER_HOUR } from '../../shared/units/time.js';

/** Without a set termination current a charge ends at C/20 of its CC current (common practice). */
const DEFAULT_TERM_FRACTION = 1 / 20;
/** A charger needs a moment to push current before "too little current" can mean "full". */
const CHARGED_SETTLE_S = 1;

/** The electrical state at one instant: what a meter on the terminals would see. */
export interface OperatingPoint {
  /** Current through the cells (positive = discharge). */
  cellAmps: number;
  heaterAmps: number;
  /** Current through the terminals, heater included (positive = discharge). */
  amps: number;
  volts: number;
}

/** The battery on its bench: pack, BMS, heater, chamber and test program, stepped in time. */
export interface Bench {
  readonly pack: Pack;
  readonly events: SimEvent[];
  readonly totals: SimTotals;
  readonly t: number;
  readonly tempCelsius: number;
  readonly ambientCelsius: number;
  readonly stepIndex: number;
  readonly done: boolean;
  readonly bms: Bms | undefined;
  readonly heater: HeaterController | undefined;
  /** The operating point right now. */
  point(): OperatingPoint;
  /** Advances the physics by dtSeconds seconds. */
  advance(dtSeconds: number): void;
}

/**
 * Creates the bench model for a scenario; physics randomness comes from `prng`. With a
 * `drive`, instruments commanded from outside load or charge the pack during rest steps.
 */
export function createBench(scenario: Scenario, prng: Prng, drive?: ExternalDrive): Bench {
  const pack = buildPack(scenario.pack, prng);
  const bms = scenario.bms ? createBms(scenario.bms) : undefined;
  const heater = scenario.pack.heater ? createHeater(scenario.pack.heater) : undefined;
  const events: SimEvent[] = [{ t: 0, kind: 'step-start', step: 0 }];
  const totals: SimTotals = { netWh: 0, netAh: 0, dischargedWh: 0, chargedWh: 0, heaterWh: 0 };
  let t = 0;
  let tempCelsius = scenario.pack.initialTempCelsius;
  let stepIndex = 0;
  let stepElapsedSeconds = 0;
  const currentStep = () => scenario.program[stepIndex];

  const point = (): OperatingPoint => {
    const step = currentStep();
    if (!step) return { cellAmps: 0, heaterAmps: 0, amps: 0, volts: pack.sourceVolts(tempCelsius) };
    const sourceVolts = pack.sourceVolts(tempCelsius);
    const ohms = pack.ohms(tempCelsius);
    const demand = step.kind === 'rest' ? drive?.demandAmps(sourceVolts, ohms) : undefined;
    if (demand !== undefined) return drivenPoint(demand, sourceVolts, ohms);
    if (step.kind === 'discharge' || step.kind === 'rest') {
      const blocked = bms?.dischargeOpen ?? false;
      const cellAmps = step.kind === 'discharge' && !blocked ? dischargeAmps(step.load, sourceVolts, ohms) : 0;
      const volts = blocked && scenario.bms?.openTerminal === 'zero' ? 0 : sourceVolts - cellAmps * ohms;
      return { cellAmps, heaterAmps: 0, amps: cellAmps, volts };
    }
    // The pad hangs on the charger side of the charge switch, so it runs even when charging is blocked.
    const heaterAmps = heater ? heater.amps(sourceVolts, t) : 0;
    const cellAmps = bms?.chargeOpen ? 0 : chargeAmps(step.charger, sourceVolts, ohms, heaterAmps);
    return { cellAmps, heaterAmps, amps: cellAmps - heaterAmps, volts: sourceVolts - cellAmps * ohms };
  };

  /** The pack under the instruments: the BMS blocks the direction it has opened. */
  const drivenPoint = (demand: number, sourceVolts: number, ohms: number): OperatingPoint => {
    const dischargeOpen = bms?.dischargeOpen ?? false;
    const blocked = demand > 0 ? dischargeOpen : demand < 0 ? (bms?.chargeOpen ?? false) : false;
    const cellAmps = blocked ? 0 : demand;
    const volts = dischargeOpen && cellAmps >= 0 && scenario.bms?.openTerminal === 'zero' ? 0 : sourceVolts - cellAmps * ohms;
    return { cellAmps, heaterAmps: 0, amps: cellAmps, volts };
  };

  const stopReason = (p: OperatingPoint, trips: SimEvent[], chargeWasOpen: boolean): SimEvent['reason'] | undefined => {
    const step = currentStep();
    if (step.kind === 'discharge' && step.endVolts !== undefined && p.cellAmps > 0 && p.volts < step.endVolts) return 'end-volts';
    // Only a switch that stops this step's current counts: a cold-charge flag does not end a discharge.
    const blocked = step.kind === 'discharge' ? bms?.dischargeOpen : step.kind === 'charge' ? bms?.chargeOpen : (bms?.active.length ?? 0) > 0;
    if (step.stopWhen === 'bms-trip' && blocked && trips.some((e) => e.kind === 'bms-trip')) return 'bms-trip';
    if (step.stopWhen === 'bms-release' && !blocked && trips.some((e) => e.kind === 'bms-release')) return 'bms-release';
    // A blocked charger carries no current: that is not a full pack.
    if (step.kind === 'charge' && step.stopWhen === 'charged' && !chargeWasOpen && !bms?.chargeOpen) {
      const termAmps = step.charger.termAmps ?? step.charger.ccAmps * DEFAULT_TERM_FRACTION;
      if (-p.cellAmps < termAmps && stepElapsedSeconds > CHARGED_SETTLE_S) return 'charged';
    }
    return stepElapsedSeconds >= step.maxSeconds ? 'max-time' : undefined;
  };

  const advance = (dtSeconds: number): void => {
    // After the program ends the bench idles (no load, no charger) so time can still pass.
    const p = point();
    const chargeWasOpen = bms?.chargeOpen ?? false;
    const ambientCelsius = ambientAt(scenario.ambient, t);
    const cellVolts = pack.cellVolts(p.cellAmps, tempCelsius);
    const heaterWatts = p.heaterAmps * p.volts;
    totals.netWh += (p.volts * p.amps * dtSeconds) / SECONDS_PER_HOUR;
    totals.netAh += (p.amps * dtSeconds) / SECONDS_PER_HOUR;
    if (p.amps > 0) totals.dischargedWh += (p.volts * p.amps * dtSeconds) / SECONDS_PER_HOUR;
    else totals.chargedWh -= (p.volts * p.amps * dtSeconds) / SECONDS_PER_HOUR;
    totals.heaterWh += (heaterWatts * dtSeconds) / SECONDS_PER_HOUR;
    if (currentStep()?.kind === 'rest') drive?.record(p.volts, p.amps, dtSeconds, t + dtSeconds);
    const heatWatts = pack.step(p.cellAmps, dtSeconds, tempCelsius) + heaterWatts;
    tempCelsius = stepTemperature(tempCelsius, ambientCelsius, heatWatts, dtSeconds, scenario.pack.thermal);
    t += dtSeconds;
    stepElapsedSeconds += dtSeconds;
    const changes: SimEvent[] = (bms?.update({ cellVolts, amps: p.cellAmps, tempCelsius }, dtSeconds) ?? []).map((c) => ({ t, tempCelsius, ...c }));
    events.push(...changes);
    if (heater) {
      const charging = currentStep()?.kind === 'charge';
      const change = charging ? heater.update(tempCelsius, t) : heater.on ? heater.update(Infinity, t) : undefined;
      if (change) events.push({ t, kind: change === 'on' ? 'heater-on' : 'heater-off', tempCelsius });
    }
    const reason = currentStep() ? stopReason(p, changes, chargeWasOpen) : undefined;
    if (reason) {
      events.push({ t, kind: 'step-end', step: stepIndex, reason });
      stepIndex += 1;
      stepElapsedSeconds = 0;
      if (currentStep()) events.push({ t, kind: 'step-start', step: stepIndex });
    }
  };

  return {
    pack, events, totals, bms, heater, point, advance,
    get t() { return t; },
    get tempCelsius() { return tempCelsius; },
    get ambientCelsius() { return ambientAt(scenario.ambient, t); },
    get stepIndex() { return stepIndex; },
    get done() { return stepIndex >= scenario.program.length; },
  };
}
