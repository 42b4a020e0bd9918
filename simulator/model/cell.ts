import { CHEMISTRIES, type Chemistry } from './chemistry.js';
import { interpolate, ocvAt } from './ocv.js';
import { SECONDS_PER_HOUR } from '../../shared/units/time.js';

const REFERENCE_TEMP_C = 25;
/** Below this state of charge the resistance climbs (the knee near empty). */
const LOW_SOC_KNEE = 0.12;
/** How many times the resistance multiplies at 0 % through the low-SoC knee. */
const LOW_SOC_GAIN: Readonly<Record<Chemistry, number>> = { lfp: 2, nmc: 2, 'lead-acid': 6 };
/** Volts per unit of SoC below empty: an over-discharged cell collapses steeply. */
const OVER_DISCHARGE_SLOPE_VOLTS = 20;
/**
 * Near full, charging meets a steep polarisation (the end-of-charge voltage rise): above
 * this state of charge the RC pair's resistance grows, so a CC-CV charge tapers at the
 * charger's voltage while the rested voltage stays on the rested table. It relaxes with
 * the RC time constant once the charger stops.
 */
const HIGH_SOC_KNEE = 0.9;
/** How many times the RC resistance multiplies at 100 % on charge (chosen so a 3.6 V a cell LFP charge tapers near full). */
const HIGH_SOC_CHARGE_GAIN: Readonly<Record<Chemistry, number>> = { lfp: 80, nmc: 0, 'lead-acid': 0 };
/** Cold electrolyte is limited: resistance growth is capped so the exponential stays sane. */
const MAX_COLD_FACTOR = 20;

export interface CellParams {
  chemistry: Chemistry;
  capacityAh: number;
  /** Capacity at the chemistry's rated rate, for the Peukert reference current. */
  ratedAh: number;
  ohmicOhms: number;
  initialSoc: number;
}

/** One cell: state of charge, ohmic resistance and one RC pair. */
export interface Cell {
  readonly params: CellParams;
  soc: number;
  /** Voltage across the RC pair (positive while discharging). */
  rcVolts: number;
  /** Open-circuit volts at the present state of charge, with the capacity usable at tempCelsius. */
  ocv(tempCelsius: number): number;
  /** Ohmic resistance at a temperature and the present state of charge. */
  ohms(tempCelsius: number): number;
  /** RC pair resistance at a temperature, carrying amps (charging near full adds the end-of-charge rise). */
  rcOhms(tempCelsius: number, amps?: number): number;
  /** Advances the cell by dtSeconds seconds carrying amps (positive = discharge). */
  step(amps: number, dtSeconds: number, tempCelsius: number): void;
}

/** Creates a cell model from its parameters. */
export function createCell(params: CellParams): Cell {
  const chem = CHEMISTRIES[params.chemistry];
  const referenceAmps = params.ratedAh / chem.ratedHours;
  // A cold cell empties early: depth of discharge counts against the capacity usable at its
  // temperature, and comes back when it warms (the charge is still there, just not reachable).
  const usableSoc = (soc: number, tempCelsius: number): number => 1 - (1 - soc) / interpolate(chem.capacityByTemp, tempCelsius);
  const temperatureFactor = (tempCelsius: number): number =>
    Math.min(MAX_COLD_FACTOR, Math.exp(chem.resistancePerKelvin * (REFERENCE_TEMP_C - tempCelsius)));

  const cell: Cell = {
    params,
    soc: params.initialSoc,
    rcVolts: 0,
    ocv(tempCelsius) {
      const soc = usableSoc(cell.soc, tempCelsius);
      if (soc >= 0) return ocvAt(params.chemistry, soc);
      return ocvAt(params.chemistry, 0) + OVER_DISCHARGE_SLOPE_VOLTS * soc;
    },
    ohms(tempCelsius) {
      const depth = Math.max(0, 1 - usableSoc(cell.soc, tempCelsius) / LOW_SOC_KNEE);
      const lowSocFactor = 1 + LOW_SOC_GAIN[params.chemistry] * depth * depth;
      return params.ohmicOhms * temperatureFactor(tempCelsius) * lowSocFactor;
    },
    rcOhms(tempCelsius, amps = 0) {
      const depth = amps < 0 ? Math.max(0, (cell.soc - HIGH_SOC_KNEE) / (1 - HIGH_SOC_KNEE)) : 0;
      const endOfCharge = 1 + HIGH_SOC_CHARGE_GAIN[params.chemistry] * depth * depth;
      return params.ohmicOhms * chem.rcResistanceRatio * temperatureFactor(tempCelsius) * endOfCharge;
    },
    step(amps, dtSeconds, tempCelsius) {
      // Exact solution of the RC pair for a current held constant over the step.
      const decay = Math.exp(-dtSeconds / chem.rcTauSeconds);
      cell.rcVolts = cell.rcVolts * decay + amps * cell.rcOhms(tempCelsius, amps) * (1 - decay);
      // Peukert: discharging faster than the rated rate uses up more charge than it delivers.
      const peukert =
        amps > 0 ? Math.pow(amps / referenceAmps, chem.peukertExponent - 1) : 1;
      cell.soc -= (amps * peukert * dtSeconds) / (SECONDS_PER_HOUR * params.capacityAh);
    },
  };
  return cell;
}
