import { formatDuration } from '../../lib/units';

/** Says how old stale numbers are, beside them: "Last reading 2 min 5 s ago". */
export function ReadingAgeNote({ ageSeconds, className = '' }: { ageSeconds: number | null; className?: string }) {
  if (ageSeconds === null) return null;
  return (
    <p role="status" data-testid="reading-age" className={`text-sm font-semibold text-caution ${className}`}>
      Stale: last reading {formatDuration(ageSeconds)} ago
    </p>
  );
}
