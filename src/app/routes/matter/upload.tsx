import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { Notice, PageHeader } from '@/components/ui';
import { custodiansQueryOptions } from '@/features/documents/api/get-custodians';
import { UploadPanel } from '@/features/documents/components/upload-panel';
import { indexStateQueryOptions } from '@/features/indexing/api/get-index-state';
import { IndexStatusPanel } from '@/features/indexing/components/index-status-panel';
import { useMatterPermission } from '@/lib/authorization';
import { parseMatterId, useMatterId } from './layout';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    if (Number.isNaN(matterId)) return null;
    void queryClient.prefetchQuery(custodiansQueryOptions(matterId));
    void queryClient.prefetchQuery(indexStateQueryOptions(matterId));
    return null;
  };

/** Upload: leads and paralegals add files to the matter (documents.upload). */
export function UploadRoute() {
  const matterId = useMatterId();
  const allowed = useMatterPermission('documents.upload');
  if (!allowed) {
    return (
      <Notice tone="warn" title="Not available to your role">
        Only the matter lead and paralegals add documents to a matter.
      </Notice>
    );
  }
  return (
    <div data-testid="upload-page">
      <PageHeader
        title="Upload documents"
        description="Each file gets a control number in load order. Exact copies are recorded as duplicates and read once; files that cannot be read are kept with the reason, and the rest of the upload goes on."
      />
      <div className="grid gap-5 xl:grid-cols-[minmax(0,1fr)_22rem]">
        <UploadPanel matterId={matterId} />
        <div className="xl:sticky xl:top-4 xl:self-start">
          <IndexStatusPanel matterId={matterId} />
        </div>
      </div>
    </div>
  );
}
