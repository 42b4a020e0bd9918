import { PageHeader } from '../../components/ui/card';

/** Any address the app does not know, or an id that is not a number. */
export function NotFound() {
  return <PageHeader title="Not found" subtitle="There is nothing at this address." />;
}

export { NotFound as Component };
