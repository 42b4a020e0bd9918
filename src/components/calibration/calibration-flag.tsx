import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { instrumentsQueryOptions } from '../../lib/queries/instruments';

/** A warning on a bench whose instruments are past their calibration due date (nothing when all are in date). */
export function CalibrationFlag({ benchId }: { benchId: number }) {
  const instruments = useQuery(instrumentsQueryOptions(benchId));
  const overdue = (instruments.data ?? []).filter((i) => i.calibration === 'overdue');
  if (overdue.length === 0) return null;
  return (
    <p role="status" className="mb-4 rounded-lg border border-state-cutoff px-3 py-2 text-sm font-semibold text-state-cutoff">
      Calibration overdue:{' '}
      {overdue.map((i) => `${i.make} ${i.model} (serial ${i.serialNumber}, due ${i.calibrationDueOn})`).join('; ')}. Readings are still corrected
      with the last calibration; runs record it as overdue. <Link to="/instruments" className="underline">Instruments</Link>
    </p>
  );
}
