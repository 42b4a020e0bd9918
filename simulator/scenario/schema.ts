import { z } from 'zod';
import { ChemistrySchema } from '../model/chemistry.js';

const positive = z.number().finite().positive();
const nonNegative = z.number().finite().nonnegative();
const celsius = z.number().finite().min(-60).max(150);

/** Per-cell deviations: the weak cell of a pack, a cell that starts lower, a high-resistance cell. */
export const CellOverrideSchema = z.object({
  index: z.number().int().nonnegative(),
  capacityFactor: positive.optional(),
  resistanceFactor: positive.optional(),
  socOffset: z.number().finite().min(-1).max(1).optional(),
});

/** A heater driven by pulse-width modulation while on: `onSeconds` seconds powered, `offSeconds` seconds not, repeated. */
export const HeaterPwmSchema = z.object({ onSeconds: positive, offSeconds: positive });

export const HeaterSchema = z
  .object({ watts: positive, ratedVolts: positive, onBelowCelsius: celsius, offAboveCelsius: celsius, pwm: HeaterPwmSchema.optional() })
  .refine((h) => h.offAboveCelsius > h.onBelowCelsius, { message: 'offAboveCelsius must be above onBelowCelsius (hysteresis)' });

export const PackSchema = z.object({
  label: z.string().min(1),
  chemistry: ChemistrySchema,
  cellsInSeries: z.number().int().min(1).max(400),
  ratedAh: positive,
  /** Actual capacity over rated (a pack that gives 103 % has 1.03). */
  capacityFactor: positive.default(1),
  /** Cell-to-cell capacity spread, ± percent, drawn from the seed. */
  capacityTolerancePct: nonNegative.max(50).default(0),
  /** Ohmic resistance of one cell at 25 °C; defaults from the chemistry and capacity. */
  cellOhms: positive.optional(),
  initialSoc: z.number().min(0).max(1),
  initialTempCelsius: celsius,
  cells: z.array(CellOverrideSchema).default([]),
  thermal: z.object({ heatCapacityJPerK: positive, toAmbientKPerW: positive }),
  heater: HeaterSchema.optional(),
});

export const BmsSchema = z.object({
  cellUnderVolts: positive,
  underVoltDelaySeconds: nonNegative,
  underVoltRecoverySeconds: nonNegative,
  cellUnderVoltsRelease: positive,
  cellOverVolts: positive,
  overVoltDelaySeconds: nonNegative,
  overVoltRecoverySeconds: nonNegative.default(0),
  cellOverVoltsRelease: positive,
  overCurrentAmps: positive,
  overCurrentDelaySeconds: nonNegative,
  overCurrentRecoverySeconds: nonNegative,
  coldChargeBelowCelsius: celsius,
  coldChargeDelaySeconds: nonNegative,
  coldChargeReleaseCelsius: celsius,
  overTempCelsius: celsius,
  overTempDelaySeconds: nonNegative,
  overTempReleaseCelsius: celsius,
  /** What a meter on the terminals reads while discharge is blocked: 0 V, or the pack behind a diode. */
  openTerminal: z.enum(['zero', 'pack']).default('zero'),
});

export const LoadSchema = z.discriminatedUnion('mode', [
  z.object({ mode: z.literal('cc'), amps: positive }),
  z.object({ mode: z.literal('cp'), watts: positive }),
  z.object({ mode: z.literal('cr'), ohms: positive }),
]);

export const ChargerSchema = z.object({ cvVolts: positive, ccAmps: positive, termAmps: positive.optional() });

const stopWhen = z.enum(['bms-trip', 'bms-release', 'end-volts', 'charged']);

export const ProgramStepSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('discharge'), load: LoadSchema, endVolts: positive.optional(), maxSeconds: positive, stopWhen: stopWhen.optional() }),
  z.object({ kind: z.literal('charge'), charger: ChargerSchema, maxSeconds: positive, stopWhen: stopWhen.optional() }),
  z.object({ kind: z.literal('rest'), maxSeconds: positive, stopWhen: stopWhen.optional() }),
]);

export const MeterSchema = z.object({
  readingPeriodSeconds: positive.default(1),
  voltsNoise: nonNegative.default(0),
  ampsNoise: nonNegative.default(0),
  tempNoise: nonNegative.default(0),
  voltsStep: nonNegative.default(0.001),
  ampsStep: nonNegative.default(0.001),
  tempStep: nonNegative.default(0.1),
  dropProbability: z.number().min(0).max(1).default(0),
  corruptProbability: z.number().min(0).max(1).default(0),
  /** Simulated unplug and replug of the meter's USB cable, in simulated seconds. */
  unplugs: z.array(z.object({ atSeconds: nonNegative, forSeconds: positive })).default([]),
});

export const ScenarioSchema = z.object({
  name: z.string().regex(/^[a-z0-9-]+$/, 'kebab-case name'),
  title: z.string().min(1),
  description: z.string().min(1),
  pack: PackSchema,
  bms: BmsSchema.optional(),
  /** Chamber or room temperature over simulated time, interpolated linearly. */
  ambient: z.array(z.object({ atSeconds: nonNegative, tempCelsius: celsius })).min(1),
  program: z.array(ProgramStepSchema).min(1),
  meter: MeterSchema.default(MeterSchema.parse({})),
  /** Physics step; the meter's sample period is cut into steps no longer than this. */
  maxPhysicsStepSeconds: positive.default(0.25),
});

export type Scenario = z.infer<typeof ScenarioSchema>;
export type ScenarioInput = z.input<typeof ScenarioSchema>;
export type BmsConfig = z.infer<typeof BmsSchema>;
export type MeterConfig = z.infer<typeof MeterSchema>;
export type ProgramStep = z.infer<typeof ProgramStepSchema>;
export type LoadSpec = z.infer<typeof LoadSchema>;
export type ChargerSpec = z.infer<typeof ChargerSchema>;
