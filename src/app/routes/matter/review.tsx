import type { QueryClient } from '@tanstack/react-query';
import { type LoaderFunctionArgs, useParams } from 'react-router-dom';
import { Notice } from '@/components/ui';
import { codesQueryOptions } from '@/features/codes/api/get-codes';
import { reviewQueryOptions } from '@/features/review/api/get-review';
import {
  MissingDocument,
  ReviewPage,
  highlightFor,
} from '@/features/review/components/review-page';
import { parseSearchState } from '@/features/search/search-state';
import { useMatterPermission } from '@/lib/authorization';
import { parseMatterId, useMatterId } from './layout';

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params, request }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    const docId = parseMatterId(params.docId);
    if (Number.isNaN(matterId) || Number.isNaN(docId)) return null;
    const state = parseSearchState(new URL(request.url).searchParams);
    void queryClient.prefetchQuery(codesQueryOptions(matterId));
    void queryClient.prefetchQuery(reviewQueryOptions(matterId, docId, highlightFor(state)));
    return null;
  };

/** /matters/:matterId/review/:docId: the review screen (features/review). */
export function ReviewRoute() {
  const matterId = useMatterId();
  const docId = parseMatterId(useParams().docId);
  const allowed = useMatterPermission('documents.read');
  if (!allowed) {
    return (
      <Notice tone="warn" title="Not available to your role">
        Your role does not include reading this matter's documents.
      </Notice>
    );
  }
  if (Number.isNaN(docId)) return <MissingDocument matterId={matterId} />;
  return <ReviewPage key={docId} matterId={matterId} docId={docId} />;
}
