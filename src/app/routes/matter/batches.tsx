import { BatchesPage } from '@/features/batches/components/batches-page';
import { useMatterId } from './layout';

/** /matters/:matterId/batches */
export function BatchesRoute() {
  return <BatchesPage matterId={useMatterId()} />;
}
