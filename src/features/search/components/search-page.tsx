// The search page: query, filters, saved and recent searches, and the results.
import type { RowSelectionState } from '@tanstack/react-table';
import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useMemo, useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import type { SearchFilters, SearchMode, SearchSort } from '@shared/schemas/search';
import { ReviewCaution } from '@/components/review-caution';
import {
  Button,
  EmptyState,
  ErrorPanel,
  Notice,
  PageHeader,
  SkeletonRows,
  Spinner,
} from '@/components/ui';
import { useCodes } from '@/features/codes/api/get-codes';
import { BulkCodingBar } from '@/features/codes';
import { useCustodians } from '@/features/documents/api/get-custodians';
import { useDocument } from '@/features/documents/api/get-document';
import { ExportButtons } from '@/features/exports';
import { SavedSearchesPanel } from '@/features/saved-searches';
import { recentSearchesQueryKey } from '../api/get-recent-searches';
import { useSearch } from '../api/run-search';
import { HighlightLegend } from './highlight';
import { QueryForm } from './query-form';
import { RecentSearchesPanel } from './recent-searches-panel';
import { ResultsPager } from './results-pager';
import { RefineBar, ResultsTable } from './results-table';
import { SearchFiltersBar } from './search-filters';
import {
  MODE_LABELS,
  type SearchState,
  parseSearchState,
  reviewHref,
  searchRequestFor,
  searchStateToParams,
} from '../search-state';
import { fieldErrorOf } from '@/lib/api-client';
import { useMatterPermission } from '@/lib/authorization';

export function SearchPage({ matterId }: { matterId: number }) {
  const [params, setParams] = useSearchParams();
  const state = useMemo(() => parseSearchState(params), [params]);
  const request = useMemo(() => searchRequestFor(state), [state]);
  const search = useSearch(matterId, request);
  // Each search run is a new recent search: refresh the panel when one completes.
  const queryClient = useQueryClient();
  useEffect(() => {
    if (search.dataUpdatedAt > 0)
      void queryClient.invalidateQueries({ queryKey: recentSearchesQueryKey(matterId) });
  }, [search.dataUpdatedAt, matterId, queryClient]);
  const codes = useCodes(matterId);
  const custodians = useCustodians(matterId);
  const canCode = useMatterPermission('documents.code');

  // The selection belongs to one result set: a new query, mode or filter starts afresh.
  const identity = JSON.stringify({ ...request, offset: 0, limit: 0, sort: null });
  const [selection, setSelection] = useState<{ identity: string; rows: RowSelectionState }>({
    identity,
    rows: {},
  });
  const rowSelection = selection.identity === identity ? selection.rows : {};
  const selectedIds = Object.keys(rowSelection).map(Number);

  function go(next: Partial<SearchState>, replace = false) {
    setParams(searchStateToParams({ ...state, ...next }), { replace });
  }
  function runQuery(query: string, mode: SearchMode) {
    go({
      query,
      mode,
      pageIndex: 0,
      likeDocumentId: undefined,
      passage: undefined,
      savedSearchId: undefined,
    });
  }
  function refine(term: string) {
    runQuery(`${state.query.trim()} ${term}`.trim(), state.mode);
  }

  const similar = Boolean(state.likeDocumentId || state.passage);
  const plainQuery = !similar && state.query.trim() ? state : null;
  const data = search.data;
  // A malformed query is shown in the box, where it can be fixed, not as a failed search.
  const queryError = fieldErrorOf(search.error, 'query');

  return (
    <div data-testid="search-page">
      <PageHeader
        title="Search"
        description="Search the matter by meaning or by words, then open a result to review and code it."
        actions={
          <span className="flex flex-wrap gap-2">
            <Link
              to="term-report"
              className="inline-flex h-9 items-center rounded-md border border-line-strong bg-panel px-3.5 text-sm font-medium text-ink hover:bg-sunk"
              data-testid="open-term-report"
            >
              Search term report
            </Link>
            <ExportButtons
              matterId={matterId}
              search={
                plainQuery
                  ? {
                      query: plainQuery.query,
                      mode: plainQuery.mode,
                      filters: plainQuery.filters,
                      sort: plainQuery.sort,
                    }
                  : null
              }
            />
          </span>
        }
      />
      <ReviewCaution className="mb-4" compact />
      <div className="space-y-3">
        <div className="grid items-start gap-4 xl:grid-cols-[minmax(0,1fr)_17rem]">
          <section
            className="space-y-3 rounded-md border border-line bg-panel p-3"
            aria-label="Query and filters"
          >
            {similar ? (
              <SimilarBanner
                matterId={matterId}
                state={state}
                onClear={() => go({ likeDocumentId: undefined, passage: undefined, pageIndex: 0 })}
              />
            ) : (
              <QueryForm
                query={state.query}
                mode={state.mode}
                busy={search.isFetching}
                serverError={queryError}
                onSubmit={runQuery}
              />
            )}
            <div className="border-t border-line pt-3">
              <SearchFiltersBar
                filters={state.filters}
                onChange={(filters: SearchFilters) =>
                  go({ filters, pageIndex: 0, savedSearchId: undefined })
                }
                custodians={custodians.data?.custodians ?? []}
                codes={codes.data?.codes ?? []}
              />
            </div>
          </section>
          <aside className="space-y-3" aria-label="Saved and recent searches">
            <SavedSearchesPanel
              matterId={matterId}
              current={
                plainQuery
                  ? { query: plainQuery.query, mode: plainQuery.mode, filters: plainQuery.filters }
                  : null
              }
            />
            <RecentSearchesPanel matterId={matterId} />
          </aside>
        </div>

        <div className="min-w-0">
          {!request ? (
            <EmptyState title="Search the matter">
              Type a word, a sentence or a paragraph. Concept search also finds documents that say
              the same thing in other words; keyword search finds your words only.
            </EmptyState>
          ) : search.isPending ? (
            <SkeletonRows rows={8} label="Searching" />
          ) : search.isError && queryError ? null : search.isError ? (
            <ErrorPanel
              error={search.error}
              title="The search did not run"
              onRetry={() => void search.refetch()}
            />
          ) : data ? (
            <div className="space-y-2">
              <div className="flex flex-wrap items-baseline justify-between gap-2">
                <p
                  className="text-sm"
                  aria-live="polite"
                  data-testid="search-summary"
                  data-fetching={search.isFetching ? 'true' : 'false'}
                >
                  <strong className="text-base tabular-nums" data-testid="search-total">
                    {data.total.toLocaleString()}
                  </strong>{' '}
                  {data.total === 1 ? 'document' : 'documents'}
                  {data.capped ? ' (the first ones only)' : ''}
                  {data.conceptCutoff !== undefined ? (
                    <span data-testid="concept-cut">
                      {' '}
                      (ranked by similarity; {data.total.toLocaleString()} above{' '}
                      {data.conceptCutoff})
                    </span>
                  ) : null}{' '}
                  ·{' '}
                  <span className="tabular-nums" data-testid="search-took">
                    {data.tookMs.toLocaleString(undefined, { maximumFractionDigits: 0 })} ms
                  </span>{' '}
                  · <span data-testid="search-ran-mode">{MODE_LABELS[data.mode]}</span>
                  {data.indexVersion ? (
                    <span className="text-ink-faint"> · index v{data.indexVersion}</span>
                  ) : null}
                  {search.isFetching ? (
                    <span className="ml-2 inline-flex align-middle">
                      <Spinner size="sm" label="Updating" />
                    </span>
                  ) : null}
                </p>
                <HighlightLegend />
              </div>
              {data.notice && data.total > 0 ? <Notice tone="info">{data.notice}</Notice> : null}
              {!similar ? <RefineBar hits={data.hits} onRefine={refine} /> : null}
              {data.unknownTerms.length > 0 && !similar ? (
                <p className="text-xs text-ink-muted">
                  Not in this matter's vocabulary: {data.unknownTerms.join(', ')}
                </p>
              ) : null}
              {canCode && selectedIds.length > 0 ? (
                <BulkCodingBar
                  matterId={matterId}
                  codes={codes.data?.codes ?? []}
                  selectedIds={selectedIds}
                  onClear={() => setSelection({ identity, rows: {} })}
                />
              ) : null}
              {data.total === 0 ? (
                <EmptyState title="No document matches">
                  {data.notice ? `${data.notice} ` : ''}Try concept or hybrid mode, fewer filters,
                  or other words.
                </EmptyState>
              ) : (
                <>
                  <ResultsTable
                    hits={data.hits}
                    total={data.total}
                    pageIndex={state.pageIndex}
                    pageSize={state.pageSize}
                    sort={state.sort}
                    onSortChange={(sort: SearchSort | undefined) => go({ sort, pageIndex: 0 })}
                    rowSelection={rowSelection}
                    onRowSelectionChange={(rows) => setSelection({ identity, rows })}
                    canSelect={canCode}
                    hrefFor={(hit, index) =>
                      reviewHref(
                        matterId,
                        hit.documentId,
                        state,
                        state.pageIndex * state.pageSize + index,
                      )
                    }
                  />
                  <ResultsPager
                    pageIndex={state.pageIndex}
                    pageSize={state.pageSize}
                    total={data.total}
                    onPage={(pageIndex) => go({ pageIndex })}
                    onPageSize={(pageSize) => go({ pageSize, pageIndex: 0 })}
                  />
                </>
              )}
            </div>
          ) : null}
        </div>
      </div>
    </div>
  );
}

function SimilarBanner({
  matterId,
  state,
  onClear,
}: {
  matterId: number;
  state: SearchState;
  onClear: () => void;
}) {
  return (
    <div className="flex items-start justify-between gap-3" data-testid="similar-banner">
      <div className="min-w-0 text-sm">
        <p className="font-semibold">More like this</p>
        {state.likeDocumentId ? (
          <LikeDocument matterId={matterId} docId={state.likeDocumentId} />
        ) : (
          <blockquote className="mt-1 line-clamp-3 border-l-2 border-line-strong pl-2 font-document text-ink-muted">
            {state.passage}
          </blockquote>
        )}
        <p className="mt-1 text-xs text-ink-muted">
          Ranked in the concept space by closeness in meaning.
        </p>
      </div>
      <Button size="sm" onClick={onClear}>
        New query
      </Button>
    </div>
  );
}

function LikeDocument({ matterId, docId }: { matterId: number; docId: number }) {
  const doc = useDocument(matterId, docId);
  return (
    <p className="text-ink-muted">
      Documents close in meaning to{' '}
      <span className="font-mono text-ink">
        {doc.data?.document.controlNumber ?? `document ${docId}`}
      </span>
      {doc.data ? ` — ${doc.data.document.title || doc.data.document.name}` : ''}
    </p>
  );
}
