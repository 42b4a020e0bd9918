import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { benchesQueryOptions } from '../../lib/queries/benches';
import { instrumentsQueryOptions } from '../../lib/queries/instruments';

/**
 * A warning while instruments on a bench (or, without `benchId`, on any bench) are past their
 * calibration due date; nothing when all are in date. Instruments on the shelf are not flagged.
 */
export function CalibrationFlag({ benchId }: { benchId?: number }) {
  const instruments = useQuery(instrumentsQueryOptions(benchId ?? null));
  const benches = useQuery({ ...benchesQueryOptions(), enabled: benchId === undefined });
  const overdue = (instruments.data ?? []).filter((i) => i.calibration === 'overdue' && i.benchId !== null);
  if (overdue.length === 0) return null;
  const where = (id: number | null) => (benchId !== undefined ? '' : ` on ${benches.data?.find((b) => b.id === id)?.name ?? `bench ${id}`}`);
  return (
    <p role="status" className="mb-4 rounded-lg border border-state-cutoff px-3 py-2 text-sm font-semibold text-state-cutoff">
      Calibration overdue:{' '}
      {overdue.map((i) => `${i.make} ${i.model} (serial ${i.serialNumber}, due ${i.calibrationDueOn})${where(i.benchId)}`).join('; ')}. Readings are
      still corrected with the last calibration; runs record it as overdue. <Link to="/instruments" className="inline-flex min-h-11 items-center underline">Instruments</Link>
    </p>
  );
}
