import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { PageHeader } from '@/components/ui';
import { prioritisedStatusQueryOptions } from '@/features/prioritised/api/get-prioritised-status';
import { PrioritisedReview } from '@/features/prioritised/components/prioritised-review';
import { parseMatterId, useMatterId } from './layout';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    if (!Number.isNaN(matterId))
      void queryClient.prefetchQuery(prioritisedStatusQueryOptions(matterId));
    return null;
  };

export function PrioritisedRoute() {
  const matterId = useMatterId();
  return (
    <div>
      <PageHeader
        title="Prioritised review"
        description="A ranking of the uncoded documents learned from the team’s Responsive and Not responsive codes, retrained in the background as codes arrive."
      />
      <PrioritisedReview matterId={matterId} />
    </div>
  );
}
