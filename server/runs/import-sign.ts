import { InvalidInputError } from '../domain/domain-errors.js';
import { SECONDS_PER_HOUR } from '../../shared/units/time.js';

/** A direction carrying less than this share of the other's Ah is noise around zero, not a charge or discharge. */
export const MINOR_DIRECTION_SHARE = 0.05;
/**
 * Mean voltages of the two directions closer than this (relative) cannot tell charge from
 * discharge. A pack discharges below and charges above its rest voltage; the split is the
 * IR drop both ways plus polarisation, a few per cent at bench rates (common practice).
 */
export const MIN_VOLTAGE_SPLIT = 0.005;
/** A one-way log whose voltage moves less than this (relative, 12 mV on 12 V: a few counts of a bench meter) shows no trend. */
export const MIN_VOLTAGE_TREND = 0.001;

interface DirectionTally {
  ah: number;
  wh: number;
  firstVolts: number | null;
  lastVolts: number | null;
}

/** Ah, Wh and first and last volts of each current sign as the file writes it. */
export interface SignTally {
  positive: DirectionTally;
  negative: DirectionTally;
}

/** An empty tally. */
export function createSignTally(): SignTally {
  const empty = (): DirectionTally => ({ ah: 0, wh: 0, firstVolts: null, lastVolts: null });
  return { positive: empty(), negative: empty() };
}

/** Adds one reading held for `dtSeconds` (0 for the first) to the tally. */
export function tallyReading(tally: SignTally, dtSeconds: number, volts: number, amps: number): void {
  if (amps === 0) return;
  const d = amps > 0 ? tally.positive : tally.negative;
  const ah = (Math.abs(amps) * dtSeconds) / SECONDS_PER_HOUR;
  d.ah += ah;
  d.wh += ah * volts;
  d.firstVolts ??= volts;
  d.lastVolts = volts;
}

/** The sign to apply and why, in words for the import result. */
export interface SignDecision {
  /** True when the file's negative amps are discharge (they are made positive). */
  flip: boolean;
  reason: string;
}

const fmtV = (v: number) => `${v.toFixed(3)} V`;
const ask = (why: string) => new InvalidInputError(`The current's sign cannot be told from this file (${why}); choose which sign is discharge`, { currentSign: ['choose the sign'] });

/**
 * Decides which sign of the file's current is discharge, by energy rather than by row counts:
 * with current both ways, the direction whose Wh per Ah (mean voltage) is lower is discharge
 * (a pack sits below its rest voltage while discharging and above it while charging, common
 * practice), however long each lasted; with current one way only, falling voltage means
 * discharge and rising voltage charge. Throws an InvalidInputError asking for the sign when neither tells.
 */
export function decideCurrentSign(tally: SignTally): SignDecision {
  const { positive: p, negative: n } = tally;
  if (p.ah === 0 && n.ah === 0) return { flip: false, reason: 'no current flows in the file; sign left as written' };
  const major = Math.max(p.ah, n.ah);
  if (Math.min(p.ah, n.ah) >= MINOR_DIRECTION_SHARE * major) {
    const meanP = p.wh / p.ah;
    const meanN = n.wh / n.ah;
    if (Math.abs(meanP - meanN) < MIN_VOLTAGE_SPLIT * Math.max(meanP, meanN)) {
      throw ask(`current flows both ways at the same mean voltage, ${fmtV(meanP)} positive and ${fmtV(meanN)} negative`);
    }
    const flip = meanN < meanP;
    const [dis, chg] = flip ? [meanN, meanP] : [meanP, meanN];
    return { flip, reason: `${flip ? 'negative' : 'positive'} amps are discharge: they flow at a mean ${fmtV(dis)}, below the ${fmtV(chg)} of the other direction` };
  }
  const dominant = p.ah >= n.ah ? p : n;
  const word = dominant === p ? 'positive' : 'negative';
  const drop = dominant.firstVolts! - dominant.lastVolts!;
  if (Math.abs(drop) < MIN_VOLTAGE_TREND * Math.abs(dominant.firstVolts!)) {
    throw ask(`current flows ${word} only and the voltage stays near ${fmtV(dominant.firstVolts!)}`);
  }
  const isDischarge = drop > 0;
  return {
    flip: isDischarge === (dominant === n),
    reason: `${word} amps are ${isDischarge ? 'discharge' : 'charge'}: the voltage ${isDischarge ? 'falls' : 'rises'} from ${fmtV(dominant.firstVolts!)} to ${fmtV(dominant.lastVolts!)} while they flow`,
  };
}
