import type { QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { Notice } from '@/components/ui';
import { codesQueryOptions } from '@/features/codes/api/get-codes';
import { searchQueryOptions } from '@/features/search/api/run-search';
import { SearchPage } from '@/features/search/components/search-page';
import { TermReportPage } from '@/features/search/components/term-report-page';
import { parseSearchState, searchRequestFor } from '@/features/search/search-state';
import { useMatterPermission } from '@/lib/authorization';
import { parseMatterId, useMatterId } from './layout';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params, request }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    if (Number.isNaN(matterId)) return null;
    void queryClient.prefetchQuery(codesQueryOptions(matterId));
    const state = parseSearchState(new URL(request.url).searchParams);
    const body = searchRequestFor(state);
    if (body) void queryClient.prefetchQuery(searchQueryOptions(matterId, body));
    return null;
  };

function NotAllowed() {
  return (
    <Notice tone="warn" title="Not available to your role">
      Your role does not include searching this matter.
    </Notice>
  );
}

/** Search: concept, keyword or hybrid search over the matter, with review and coding. */
export function SearchRoute() {
  const matterId = useMatterId();
  const allowed = useMatterPermission('search.run');
  return allowed ? <SearchPage matterId={matterId} /> : <NotAllowed />;
}

/** Search term report: hits per negotiated term. */
export function TermReportRoute() {
  const matterId = useMatterId();
  const allowed = useMatterPermission('search.run');
  return allowed ? <TermReportPage matterId={matterId} /> : <NotAllowed />;
}
