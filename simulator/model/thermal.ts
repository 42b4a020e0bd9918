/** Lumped thermal parameters of a pack in its surroundings. */
export interface ThermalParams {
  /** Heat capacity of the whole pack (J/K): mass times specific heat. */
  heatCapacityJPerK: number;
  /** Thermal resistance from the pack to the ambient air (K/W). */
  toAmbientKPerW: number;
}

/**
 * Advances the pack temperature by one step of Newton cooling with a heat input:
 * C·dT/dt = P − (T − T_ambient)/R, solved exactly for constant P and ambient over the step.
 */
export function stepTemperature(
  tempCelsius: number,
  ambientCelsius: number,
  heatWatts: number,
  dtSeconds: number,
  params: ThermalParams,
): number {
  const steadyCelsius = ambientCelsius + heatWatts * params.toAmbientKPerW;
  const tauSeconds = params.heatCapacityJPerK * params.toAmbientKPerW;
  return steadyCelsius + (tempCelsius - steadyCelsius) * Math.exp(-dtSeconds / tauSeconds);
}
