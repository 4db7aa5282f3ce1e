import { Notice } from '@/components/ui';
import { ProductionsPage } from '@/features/productions/components/productions-page';
import { useMatterPermission } from '@/lib/authorization';
import { useMatterId } from './layout';

export function ProductionsRoute() {
  const matterId = useMatterId();
  if (!useMatterPermission('productions.manage'))
    return (
      <Notice tone="warn" title="Not available to your role">
        Productions are built by the matter lead and attorneys.
      </Notice>
    );
  return <ProductionsPage matterId={matterId} />;
}
