import type { ScenarioInput } from '../scenario/schema.js';

type BmsInput = NonNullable<ScenarioInput['bms']>;

/**
 * Protection settings typical of a drop-in LFP battery's BMS (common practice, values from
 * memory): 2.5 V a cell under-voltage, 3.65 V over-voltage, no charging below 0 °C,
 * cutoff near 60 °C. Scenarios override what they test.
 */
export function lfpBms(overrides: Partial<BmsInput> = {}): BmsInput {
  return {
    cellUnderVolts: 2.5,
    underVoltDelaySeconds: 2,
    underVoltRecoverySeconds: 60,
    cellUnderVoltsRelease: 2.55,
    cellOverVolts: 3.65,
    overVoltDelaySeconds: 2,
    cellOverVoltsRelease: 3.4,
    overCurrentAmps: 150,
    overCurrentDelaySeconds: 1,
    overCurrentRecoverySeconds: 30,
    coldChargeBelowCelsius: 0,
    coldChargeDelaySeconds: 5,
    coldChargeReleaseCelsius: 3,
    overTempCelsius: 60,
    overTempDelaySeconds: 10,
    overTempReleaseCelsius: 50,
    openTerminal: 'zero',
    ...overrides,
  };
}

/** Lumped thermal values for prismatic LFP cells: about 1 kJ/(kg·K) (from memory) and ~2 kg per 100 Ah cell. */
export function lfpThermal(cells: number, ratedAh: number): { heatCapacityJPerK: number; toAmbientKPerW: number } {
  const JOULES_PER_K_PER_AH_CELL = 25;
  const PACK_TO_AMBIENT_K_PER_W_AT_100AH_4S = 0.8;
  const REFERENCE_CELL_AH = 400;
  return {
    heatCapacityJPerK: JOULES_PER_K_PER_AH_CELL * ratedAh * cells,
    // Heat leaves through the surface, which grows as volume to the power 2/3.
    toAmbientKPerW: PACK_TO_AMBIENT_K_PER_W_AT_100AH_4S * Math.pow(REFERENCE_CELL_AH / (ratedAh * cells), 2 / 3),
  };
}
