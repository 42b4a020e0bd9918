import { z } from 'zod';
import { InstrumentDriverSchema } from './instrument-driver.js';

/** A bench's controllable instruments: at most one load and one supply (charger); null = none. */
export const BenchInstrumentsSchema = z
  .object({
    load: InstrumentDriverSchema.nullable().default(null),
    supply: InstrumentDriverSchema.nullable().default(null),
  })
  .refine((b) => b.load === null || b.load.role === 'load', { message: "The load's driver must have the role load", path: ['load', 'role'] })
  .refine((b) => b.supply === null || b.supply.role === 'supply', { message: "The supply's driver must have the role supply", path: ['supply', 'role'] })
  .refine((b) => b.load === null || b.supply === null || b.load.port.path !== b.supply.port.path, { message: 'The load and the supply cannot share one port', path: ['supply', 'port', 'path'] });
export type BenchInstrumentsConfig = z.infer<typeof BenchInstrumentsSchema>;
