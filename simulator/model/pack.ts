import { createCell, type Cell } from './cell.js';
import type { Chemistry } from './chemistry.js';

export interface CellSpec {
  capacityAh: number;
  ohmicOhms: number;
  initialSoc: number;
}

/** N cells in series sharing one current and one lumped temperature. */
export interface Pack {
  readonly cells: readonly Cell[];
  /** Sum of the cells' open-circuit volts minus their RC voltages: the source behind the resistance. */
  sourceVolts(tempCelsius: number): number;
  /** Sum of the cells' ohmic resistances at a temperature. */
  ohms(tempCelsius: number): number;
  /** Each cell's terminal volts while the pack carries amps. */
  cellVolts(amps: number, tempCelsius: number): number[];
  /** Advances every cell and returns the heat released (W) during the step. */
  step(amps: number, dtSeconds: number, tempCelsius: number): number;
}

/** Builds a series pack from per-cell specifications. */
export function createPack(chemistry: Chemistry, ratedAh: number, specs: readonly CellSpec[]): Pack {
  const cells = specs.map((spec) =>
    createCell({ chemistry, ratedAh, capacityAh: spec.capacityAh, ohmicOhms: spec.ohmicOhms, initialSoc: spec.initialSoc }),
  );
  return {
    cells,
    sourceVolts: (tempCelsius) => cells.reduce((sum, cell) => sum + cell.ocv(tempCelsius) - cell.rcVolts, 0),
    ohms: (tempCelsius) => cells.reduce((sum, cell) => sum + cell.ohms(tempCelsius), 0),
    cellVolts: (amps, tempCelsius) => cells.map((cell) => cell.ocv(tempCelsius) - cell.rcVolts - amps * cell.ohms(tempCelsius)),
    step(amps, dtSeconds, tempCelsius) {
      let heatWatts = 0;
      for (const cell of cells) {
        // Joule heat in the ohmic part plus the RC pair's resistor, taken before the update.
        heatWatts += amps * amps * cell.ohms(tempCelsius) + (cell.rcVolts * cell.rcVolts) / cell.rcOhms(tempCelsius, amps);
        cell.step(amps, dtSeconds, tempCelsius);
      }
      return heatWatts;
    },
  };
}
