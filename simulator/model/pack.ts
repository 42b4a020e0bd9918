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
  sourceVolts(tempC: number): number;
  /** Sum of the cells' ohmic resistances at a temperature. */
  ohms(tempC: number): number;
  /** Each cell's terminal volts while the pack carries amps. */
  cellVolts(amps: number, tempC: number): number[];
  /** Advances every cell and returns the heat released (W) during the step. */
  step(amps: number, dtS: number, tempC: number): number;
}

/** Builds a series pack from per-cell specifications. */
export function createPack(chemistry: Chemistry, ratedAh: number, specs: readonly CellSpec[]): Pack {
  const cells = specs.map((spec) =>
    createCell({ chemistry, ratedAh, capacityAh: spec.capacityAh, ohmicOhms: spec.ohmicOhms, initialSoc: spec.initialSoc }),
  );
  return {
    cells,
    sourceVolts: (tempC) => cells.reduce((sum, cell) => sum + cell.ocv(tempC) - cell.rcVolts, 0),
    ohms: (tempC) => cells.reduce((sum, cell) => sum + cell.ohms(tempC), 0),
    cellVolts: (amps, tempC) => cells.map((cell) => cell.ocv(tempC) - cell.rcVolts - amps * cell.ohms(tempC)),
    step(amps, dtS, tempC) {
      let heatWatts = 0;
      for (const cell of cells) {
        // Joule heat in the ohmic part plus the RC pair's resistor, taken before the update.
        heatWatts += amps * amps * cell.ohms(tempC) + (cell.rcVolts * cell.rcVolts) / cell.rcOhms(tempC, amps);
        cell.step(amps, dtS, tempC);
      }
      return heatWatts;
    },
  };
}
