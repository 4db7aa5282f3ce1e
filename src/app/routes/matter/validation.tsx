import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { Notice, PageHeader } from '@/components/ui';
import { samplesQueryOptions } from '@/features/validation/api/get-samples';
import { ValidationSamples } from '@/features/validation/components/validation-samples';
import { useMatterPermission } from '@/lib/authorization';
import { parseMatterId, useMatterId } from './layout';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    if (!Number.isNaN(matterId)) void queryClient.prefetchQuery(samplesQueryOptions(matterId));
    return null;
  };

export function ValidationRoute() {
  const matterId = useMatterId();
  const allowed = useMatterPermission('validation.view');
  return (
    <div>
      <PageHeader
        title="Recall validation"
        description="Prevalence and elusion samples, with exact confidence intervals, for the team’s certification of a production."
      />
      {allowed ? (
        <ValidationSamples matterId={matterId} />
      ) : (
        <Notice tone="warn" title="Not available to your role">
          The matter lead and attorneys see recall validation.
        </Notice>
      )}
    </div>
  );
}
