import { CHEMISTRIES, type Chemistry } from './chemistry.js';

/** Open-circuit volts of one cell at a state of charge (clamped to 0..1), by linear interpolation. */
export function ocvAt(chemistry: Chemistry, soc: number): number {
  const table = CHEMISTRIES[chemistry].ocvTable;
  const first = table[0];
  const last = table[table.length - 1];
  if (soc <= first[0]) return first[1];
  if (soc >= last[0]) return last[1];
  for (let i = 1; i < table.length; i += 1) {
    const [socHigh, voltsHigh] = table[i];
    if (soc <= socHigh) {
      const [socLow, voltsLow] = table[i - 1];
      return voltsLow + ((voltsHigh - voltsLow) * (soc - socLow)) / (socHigh - socLow);
    }
  }
  return last[1];
}

/**
 * Energy-weighted mean open-circuit voltage from empty to full (Wh / Ah of an ideal slow
 * discharge): the figure cell makers call the nominal voltage.
 */
export function meanOcvCellVolts(chemistry: Chemistry): number {
  const table = CHEMISTRIES[chemistry].ocvTable;
  let area = 0;
  for (let i = 1; i < table.length; i += 1) {
    const [s0, v0] = table[i - 1];
    const [s1, v1] = table[i];
    area += ((v0 + v1) / 2) * (s1 - s0);
  }
  return area / (table[table.length - 1][0] - table[0][0]);
}
