import type { EndEstimate } from '../../../shared/measure/time-to-end';
import { formatDuration } from '../../lib/units';

/** Decimal places of "% of rated". */
const PERCENT_DIGITS = 0;

/**
 * "About 1 h 30 min to the end voltage · 10 % of rated so far": each part only when it can be
 * estimated (no rating, no load, rising voltage or too few readings hide it).
 */
export function EndEstimateLine({ estimate, className = '' }: { estimate: EndEstimate; className?: string }) {
  const { secondsToEnd, percentOfRated } = estimate;
  if (secondsToEnd === null && percentOfRated === null) return null;
  return (
    <p className={`num text-sm text-ink-muted ${className}`} data-testid="end-estimate">
      {secondsToEnd !== null && (
        <span title="Estimated from the recent power and the rated energy not yet delivered">
          about {formatDuration(secondsToEnd)} to the end voltage
        </span>
      )}
      {secondsToEnd !== null && percentOfRated !== null && ' · '}
      {percentOfRated !== null && <span>{percentOfRated.toFixed(PERCENT_DIGITS)} % of rated so far</span>}
    </p>
  );
}
