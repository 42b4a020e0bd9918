import type { Chemistry } from '../../shared/schemas/battery';

/** Trade names of the chemistries, for lists and forms. */
export const CHEMISTRY_LABEL: Record<Chemistry, string> = {
  lfp: 'LiFePO₄ (LFP)',
  nmc: 'NMC',
  nca: 'NCA',
  lco: 'LCO',
  lmo: 'LMO',
  lto: 'LTO',
  'lead-acid': 'Lead-acid',
  nimh: 'NiMH',
};
