import { CHEMISTRIES, type Chemistry } from './chemistry.js';

/** Linear interpolation in a table of ascending x, flat beyond its ends. */
export function interpolate(table: ReadonlyArray<readonly [number, number]>, x: number): number {
  const first = table[0];
  const last = table[table.length - 1];
  if (x <= first[0]) return first[1];
  if (x >= last[0]) return last[1];
  for (let i = 1; i < table.length; i += 1) {
    const [xHigh, yHigh] = table[i];
    if (x <= xHigh) {
      const [xLow, yLow] = table[i - 1];
      return yLow + ((yHigh - yLow) * (x - xLow)) / (xHigh - xLow);
    }
  }
  return last[1];
}

/** Open-circuit volts of one cell at a state of charge (clamped to 0..1), by linear interpolation. */
export function ocvAt(chemistry: Chemistry, soc: number): number {
  return interpolate(CHEMISTRIES[chemistry].ocvTable, soc);
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
