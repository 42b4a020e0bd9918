import type { BmsConfig } from '../scenario/schema.js';

export type Protection = 'under-voltage' | 'over-voltage' | 'over-current' | 'cold-charge' | 'over-temperature';
type Blocks = 'discharge' | 'charge' | 'both';

export interface BmsInputs {
  cellVolts: readonly number[];
  /** Pack current, positive = discharge. */
  amps: number;
  tempCelsius: number;
}

export interface BmsChange {
  kind: 'bms-trip' | 'bms-release';
  protection: Protection;
  /** Index of the cell that caused a voltage trip. */
  cell?: number;
}

interface Rule {
  protection: Protection;
  blocks: Blocks;
  delaySeconds: number;
  /** Returns the offending cell index (or -1 for a pack-level fault) when the fault is present. */
  fault(inputs: BmsInputs): number | undefined;
  release(inputs: BmsInputs, sinceTripSeconds: number): boolean;
}

/** Timers add up float steps (0.1 s ...): a tolerance keeps 600 × 0.1 s equal to 60 s. */
const TIME_EPSILON_S = 1e-6;

const indexOfMin = (values: readonly number[]): number => values.indexOf(Math.min(...values));
const indexOfMax = (values: readonly number[]): number => values.indexOf(Math.max(...values));

function rulesFor(config: BmsConfig): Rule[] {
  return [
    {
      protection: 'under-voltage',
      blocks: 'discharge',
      delaySeconds: config.underVoltDelaySeconds,
      fault: (i) => (Math.min(...i.cellVolts) < config.cellUnderVolts ? indexOfMin(i.cellVolts) : undefined),
      release: (i, since) => since >= config.underVoltRecoverySeconds && Math.min(...i.cellVolts) >= config.cellUnderVoltsRelease,
    },
    {
      protection: 'over-voltage',
      blocks: 'charge',
      delaySeconds: config.overVoltDelaySeconds,
      fault: (i) => (Math.max(...i.cellVolts) > config.cellOverVolts ? indexOfMax(i.cellVolts) : undefined),
      release: (i, since) => since >= config.overVoltRecoverySeconds && Math.max(...i.cellVolts) <= config.cellOverVoltsRelease,
    },
    {
      protection: 'over-current',
      blocks: 'discharge',
      delaySeconds: config.overCurrentDelaySeconds,
      fault: (i) => (i.amps > config.overCurrentAmps ? -1 : undefined),
      release: (_i, since) => since >= config.overCurrentRecoverySeconds,
    },
    {
      protection: 'cold-charge',
      blocks: 'charge',
      delaySeconds: config.coldChargeDelaySeconds,
      fault: (i) => (i.tempCelsius < config.coldChargeBelowCelsius ? -1 : undefined),
      release: (i) => i.tempCelsius >= config.coldChargeReleaseCelsius,
    },
    {
      protection: 'over-temperature',
      blocks: 'both',
      delaySeconds: config.overTempDelaySeconds,
      fault: (i) => (i.tempCelsius > config.overTempCelsius ? -1 : undefined),
      release: (i) => i.tempCelsius <= config.overTempReleaseCelsius,
    },
  ];
}

/** The protection board: per-rule fault timers, latched trips and their release conditions. */
export interface Bms {
  readonly dischargeOpen: boolean;
  readonly chargeOpen: boolean;
  readonly active: readonly Protection[];
  /** Advances the timers by dtSeconds with the present readings; returns trips and releases. */
  update(inputs: BmsInputs, dtSeconds: number): BmsChange[];
}

/** Creates a BMS with everything closed (conducting). */
export function createBms(config: BmsConfig): Bms {
  const rules = rulesFor(config);
  const faultSeconds = new Map<Protection, number>();
  const trippedFor = new Map<Protection, number>();
  const isOpen = (direction: 'discharge' | 'charge'): boolean =>
    rules.some((rule) => trippedFor.has(rule.protection) && (rule.blocks === direction || rule.blocks === 'both'));
  return {
    get dischargeOpen() {
      return isOpen('discharge');
    },
    get chargeOpen() {
      return isOpen('charge');
    },
    get active() {
      return [...trippedFor.keys()];
    },
    update(inputs, dtSeconds) {
      const changes: BmsChange[] = [];
      for (const rule of rules) {
        const since = trippedFor.get(rule.protection);
        if (since !== undefined) {
          const elapsed = since + dtSeconds;
          if (rule.release(inputs, elapsed + TIME_EPSILON_S)) {
            trippedFor.delete(rule.protection);
            changes.push({ kind: 'bms-release', protection: rule.protection });
          } else trippedFor.set(rule.protection, elapsed);
          continue;
        }
        const cell = rule.fault(inputs);
        if (cell === undefined) {
          faultSeconds.delete(rule.protection);
          continue;
        }
        // A fault must persist for the whole delay before the switch opens (no nuisance trips).
        const seconds = (faultSeconds.get(rule.protection) ?? 0) + dtSeconds;
        faultSeconds.set(rule.protection, seconds);
        if (seconds + TIME_EPSILON_S >= rule.delaySeconds) {
          faultSeconds.delete(rule.protection);
          trippedFor.set(rule.protection, 0);
          changes.push({ kind: 'bms-trip', protection: rule.protection, ...(cell >= 0 ? { cell } : {}) });
        }
      }
      return changes;
    },
  };
}
