import { CHEMISTRIES } from '../model/chemistry.js';
import { createPack, type CellSpec, type Pack } from '../model/pack.js';
import type { Prng } from '../prng.js';
import type { Scenario } from '../scenario/schema.js';

const PERCENT = 100;

/** Cell specifications for a scenario's pack: rated values, seeded spread and per-cell overrides. */
export function cellSpecs(pack: Scenario['pack'], prng: Prng): CellSpec[] {
  const baseOhms = pack.cellOhms ?? CHEMISTRIES[pack.chemistry].ohmAhProduct / pack.ratedAh;
  return Array.from({ length: pack.cellsInSeries }, (_, index) => {
    const override = pack.cells.find((cell) => cell.index === index);
    const spread = 1 + (pack.capacityTolerancePct / PERCENT) * prng.symmetric();
    const soc = pack.initialSoc + (override?.socOffset ?? 0);
    return {
      capacityAh: pack.ratedAh * pack.capacityFactor * spread * (override?.capacityFactor ?? 1),
      ohmicOhms: baseOhms * (override?.resistanceFactor ?? 1),
      initialSoc: Math.min(1, Math.max(0, soc)),
    };
  });
}

/** Builds the series pack a scenario describes. */
export function buildPack(pack: Scenario['pack'], prng: Prng): Pack {
  return createPack(pack.chemistry, pack.ratedAh, cellSpecs(pack, prng));
}
