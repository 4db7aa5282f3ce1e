import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { Notice, PageHeader, QueryBoundary } from '@/components/ui';
import { codesQueryOptions, useCodes } from '@/features/codes/api/get-codes';
import { CodeGroupsPanel } from '@/features/codes/components/code-groups-panel';
import { CodeSetEditor } from '@/features/codes/components/code-set-editor';
import { useMatterPermission } from '@/lib/authorization';
import { parseMatterId, useMatterId } from './layout';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    if (!Number.isNaN(matterId)) void queryClient.prefetchQuery(codesQueryOptions(matterId));
    return null;
  };

/** The code set: names, viewer keys, privilege-log codes; the lead edits it. */
export function CodesRoute() {
  const matterId = useMatterId();
  const codes = useCodes(matterId);
  const canManage = useMatterPermission('codes.manage');
  return (
    <div data-testid="codes-page">
      <PageHeader
        title="Codes"
        description={
          canManage
            ? 'The codes reviewers apply. Archiving a code keeps it on documents already coded but stops new use; every change is in the activity log.'
            : 'The codes reviewers apply, with the key that applies each in the viewer. The matter lead edits the set.'
        }
      />
      {!canManage ? (
        <Notice tone="info" className="mb-3">
          Keys: each code's own key if the lead set one, otherwise its place in the list (1–9).
        </Notice>
      ) : null}
      <QueryBoundary query={codes} errorTitle="The codes could not be loaded">
        {(data) => (
          <>
            <CodeGroupsPanel
              matterId={matterId}
              groups={data.groups}
              codes={data.codes}
              canManage={canManage}
            />
            <CodeSetEditor matterId={matterId} codes={data.codes} canManage={canManage} />
          </>
        )}
      </QueryBoundary>
    </div>
  );
}
