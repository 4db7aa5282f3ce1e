import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { Notice, PageHeader } from '@/components/ui';
import { trashQueryOptions } from '@/features/trash/api/get-trash';
import { TrashList } from '@/features/trash/components/trash-list';
import { useMatterPermission } from '@/lib/authorization';
import { parseMatterId, useMatterId } from './layout';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    if (!Number.isNaN(matterId)) void queryClient.prefetchQuery(trashQueryOptions(matterId));
    return null;
  };

/** Trash: deleted coded documents, to restore or purge. */
export function TrashRoute() {
  const matterId = useMatterId();
  const allowed = useMatterPermission('documents.delete');
  if (!allowed) {
    return (
      <Notice tone="warn" title="Not available to your role">
        Only the matter lead sees the deleted documents.
      </Notice>
    );
  }
  return (
    <div data-testid="trash-page">
      <PageHeader
        title="Trash"
        description="Coded documents that were deleted. They are out of listings, searches and the index, but nothing is destroyed until they are purged."
      />
      <TrashList matterId={matterId} />
    </div>
  );
}
