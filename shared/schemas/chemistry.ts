import { z } from 'zod';

/** Cell chemistries the measurement core knows nominal volts for. */
export const ChemistrySchema = z.enum(['lfp', 'nmc', 'nca', 'lto', 'lead-acid', 'nimh', 'other']);
export type Chemistry = z.infer<typeof ChemistrySchema>;
