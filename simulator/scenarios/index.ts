import type { ScenarioInput } from '../scenario/schema.js';
import { benchControlLfp12v } from './bench-control-lfp-12v.js';
import { leadAcid12vReserve } from './lead-acid-12v-reserve.js';
import { lfp12v100ahCpCutoff } from './lfp-12v-100ah-cp-cutoff.js';
import { lfp12vHotCutoff } from './lfp-12v-hot-cutoff.js';
import { lfp12vWeakCell } from './lfp-12v-weak-cell.js';
import { lfp48v30ahPwmHeater } from './lfp-48v-30ah-pwm-heater.js';
import { noisyMeterUnplug } from './noisy-meter-unplug.js';
import { PROTECTION_CHECK_SCENARIOS } from './protection-checks.js';

/** Every built-in scenario (fictional packs and brands), validated when loaded. */
export const BUILT_IN_SCENARIOS: readonly ScenarioInput[] = [
  lfp12v100ahCpCutoff,
  lfp48v30ahPwmHeater,
  lfp12vHotCutoff,
  leadAcid12vReserve,
  lfp12vWeakCell,
  noisyMeterUnplug,
  ...PROTECTION_CHECK_SCENARIOS,
  benchControlLfp12v,
];
