import { RoomView } from '../../features/live/components/room-view';
import { useIdParam } from '../route-kit/use-id-param';
import { NotFound } from './not-found';

export { prefetch } from './bench';

/** The across-the-room view. */
export function Component() {
  const benchId = useIdParam('benchId');
  if (Number.isNaN(benchId)) return <NotFound />;
  return <RoomView key={benchId} benchId={benchId} />;
}
