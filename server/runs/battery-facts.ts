import type { AppContext } from '../app-context.js';
import type { BatteryFacts } from './measure-config.js';

/** Reads what the runs area needs of a battery from the foundation's model. */
export function batteryLookup(ctx: AppContext): (id: number) => Promise<BatteryFacts | null> {
  return async (id) => {
    const row = await ctx.models.Battery.findByPk(id);
    if (!row) return null;
    return {
      id: row.id, label: row.label, brand: row.brand, chemistry: row.chemistry, cellsInSeries: row.cellsInSeries,
      ratedAh: row.ratedAh, ratedWh: row.ratedWh ?? null, price: row.price ?? null, massKg: row.massKg ?? null,
      protectionSpecs: row.protectionSpecs ?? [],
    };
  };
}
