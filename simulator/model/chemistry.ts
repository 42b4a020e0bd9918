import { z } from 'zod';

export const ChemistrySchema = z.enum(['lfp', 'nmc', 'lead-acid']);
export type Chemistry = z.infer<typeof ChemistrySchema>;

/** Everything the cell model needs to know about one chemistry. */
export interface ChemistryProfile {
  /** Rested open-circuit volts per cell against state of charge (0..1), ascending SoC. */
  ocvTable: ReadonlyArray<readonly [soc: number, volts: number]>;
  /** Charge voltage a cell maker allows (the charger's constant-voltage set point). */
  maxChargeCellVolts: number;
  /** End-of-discharge voltage per cell commonly used for capacity tests. */
  endCellVolts: number;
  /** Ohmic resistance times capacity (ohm·Ah): a 100 Ah cell gets 1/100 of it. */
  ohmAhProduct: number;
  /** The RC pair's resistance as a fraction of the ohmic resistance. */
  rcResistanceRatio: number;
  /** The RC pair's time constant: how fast the voltage relaxes after the load stops. */
  rcTauSeconds: number;
  /** Relative rise of resistance per kelvin below 25 °C (and fall above it). */
  resistancePerKelvin: number;
  /** Peukert exponent: usable charge shrinks at currents above the rated rate. */
  peukertExponent: number;
  /** Hours of the rate at which the rated capacity is specified (C/20 → 20). */
  ratedHours: number;
  /** Usable share of the capacity against cell temperature (°C), ascending temperature. */
  capacityByTemp: ReadonlyArray<readonly [tempCelsius: number, share: number]>;
}

/*
 * Lithium iron phosphate: the shape (steep below 10 %, a long plateau at 3.25-3.35 V,
 * a rise in the last few percent) is that of the rested OCV curves in LFP cell
 * datasheets and in the battery-modelling literature; the points are from memory, not
 * digitised from one publication. The table is a RESTED voltage: a full cell settles to
 * about 3.35-3.45 V after an hour or more off the charger (from memory), so it ends at
 * 3.42 V, not at the 3.6-3.65 V a charger holds. Nominal 3.2 V, 3.65 V charge limit and
 * 2.5 V end voltage are the usual LFP cell datasheet values (from memory).
 */
const LFP: ChemistryProfile = {
  ocvTable: [
    [0, 2.5], [0.02, 2.85], [0.05, 3.05], [0.1, 3.18], [0.2, 3.24], [0.3, 3.27],
    [0.4, 3.285], [0.5, 3.295], [0.6, 3.305], [0.7, 3.32], [0.8, 3.33], [0.9, 3.34],
    [0.95, 3.35], [0.98, 3.37], [0.995, 3.4], [1, 3.42],
  ],
  maxChargeCellVolts: 3.65,
  endCellVolts: 2.5,
  ohmAhProduct: 0.08,
  rcResistanceRatio: 0.6,
  rcTauSeconds: 90,
  resistancePerKelvin: 0.035,
  peukertExponent: 1.03,
  ratedHours: 5,
  // LFP datasheet discharge-temperature curves: roughly 70-80 % at −10 °C and 85-90 % at 0 °C (from memory).
  capacityByTemp: [[-20, 0.6], [-10, 0.75], [0, 0.87], [25, 1], [45, 1.02]],
};

/*
 * NMC (lithium nickel manganese cobalt oxide): a sloping curve from about 3.0 V empty to
 * about 4.18 V full, nominal 3.6-3.7 V, charge limit 4.2 V, end voltage 2.5-3.0 V; shape
 * and values from memory of NMC cell datasheets and published OCV curves.
 */
const NMC: ChemistryProfile = {
  ocvTable: [
    [0, 3.0], [0.03, 3.3], [0.05, 3.42], [0.1, 3.5], [0.2, 3.58], [0.3, 3.63],
    [0.4, 3.67], [0.5, 3.72], [0.6, 3.8], [0.7, 3.88], [0.8, 3.96], [0.9, 4.06],
    [0.95, 4.11], [1, 4.18],
  ],
  maxChargeCellVolts: 4.2,
  endCellVolts: 3.0,
  ohmAhProduct: 0.09,
  rcResistanceRatio: 0.7,
  rcTauSeconds: 60,
  resistancePerKelvin: 0.03,
  peukertExponent: 1.05,
  ratedHours: 5,
  // NMC datasheets: about 80 % at −10 °C and 90 % at 0 °C (from memory).
  capacityByTemp: [[-20, 0.7], [-10, 0.8], [0, 0.9], [25, 1], [45, 1.01]],
};

/*
 * Lead-acid: the widely published rested-voltage table for a 12 V battery at 25 °C
 * (12.73 V full ... 11.51 V at 10 %, roughly linear), divided by six cells; from memory.
 * 2.0 V nominal a cell, 2.4 V absorption charge and 1.75 V end voltage at moderate rates
 * are common practice. The Peukert exponent 1.25 is a typical flooded-battery value.
 */
const LEAD_ACID: ChemistryProfile = {
  ocvTable: [
    [0, 1.89], [0.1, 1.918], [0.2, 1.943], [0.3, 1.968], [0.4, 1.993], [0.5, 2.017],
    [0.6, 2.04], [0.7, 2.062], [0.8, 2.083], [0.9, 2.103], [1, 2.122],
  ],
  maxChargeCellVolts: 2.4,
  endCellVolts: 1.75,
  ohmAhProduct: 0.1,
  rcResistanceRatio: 1,
  rcTauSeconds: 300,
  resistancePerKelvin: 0.02,
  peukertExponent: 1.25,
  ratedHours: 20,
  // Lead-acid loses about 1 % of capacity per °C below 25 °C at moderate rates (common practice, from memory).
  capacityByTemp: [[-20, 0.5], [-10, 0.65], [0, 0.8], [25, 1], [40, 1.08]],
};

export const CHEMISTRIES: Readonly<Record<Chemistry, ChemistryProfile>> = {
  lfp: LFP,
  nmc: NMC,
  'lead-acid': LEAD_ACID,
};
