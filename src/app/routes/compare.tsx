import { useSearchParams } from 'react-router-dom';
import { PackCompare } from '../../features/runs/components/pack-compare';
import { MAX_COMPARED_RUNS, RunCompare } from '../../features/runs/components/run-compare';
import { NotFound } from './not-found';

/** Several runs side by side (/runs/compare?ids=3,5) or packs from the register (/runs/compare?packs=4,7:12). */
export function Component() {
  const [params] = useSearchParams();
  if (params.has('packs')) return <PackCompare />;
  const ids = (params.get('ids') ?? '')
    .split(',')
    .filter((x) => /^\d+$/.test(x))
    .map(Number)
    .slice(0, MAX_COMPARED_RUNS);
  if (ids.length === 0) return <NotFound />;
  return <RunCompare runIds={ids} />;
}
