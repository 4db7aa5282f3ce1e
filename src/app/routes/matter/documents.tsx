import type { QueryClient } from '@tanstack/react-query';
import { Link, type LoaderFunctionArgs, useSearchParams } from 'react-router-dom';
import {
  DOCUMENTS_PAGE_DEFAULT,
  DOCUMENTS_PAGE_MAX,
  DOCUMENT_STATUSES,
  type DocumentStatus,
} from '@shared/schemas/documents';
import {
  Button,
  EmptyState,
  ErrorPanel,
  Notice,
  PageHeader,
  Select,
  SkeletonRows,
  Spinner,
} from '@/components/ui';
import { useCustodians, custodiansQueryOptions } from '@/features/documents/api/get-custodians';
import {
  type DocumentFilters,
  documentsQueryOptions,
  useDocuments,
} from '@/features/documents/api/get-documents';
import { DocumentTable } from '@/features/documents/components/document-table';
import { STATUS_LABELS } from '@/features/documents/format';
import { holdsQueryOptions, useHolds } from '@/features/holds/api/get-holds';
import { HoldsPanel } from '@/features/holds/components/holds-panel';
import { indexStateQueryOptions } from '@/features/indexing/api/get-index-state';
import { IndexStatusPanel } from '@/features/indexing/components/index-status-panel';
import { Can, useMatterPermission } from '@/lib/authorization';
import { parseMatterId, useMatterId } from './layout';

function positive(raw: string | null): number | undefined {
  const value = Number(raw);
  return Number.isInteger(value) && value > 0 ? value : undefined;
}

function filtersFrom(params: URLSearchParams): DocumentFilters {
  const status = params.get('status');
  return {
    page: positive(params.get('page')) ?? 1,
    pageSize: Math.min(
      positive(params.get('pageSize')) ?? DOCUMENTS_PAGE_DEFAULT,
      DOCUMENTS_PAGE_MAX,
    ),
    status: (DOCUMENT_STATUSES as readonly string[]).includes(status ?? '')
      ? (status as DocumentStatus)
      : undefined,
    custodian: positive(params.get('custodian')),
    batch: positive(params.get('batch')),
  };
}

export const clientLoader =
  (queryClient: QueryClient) =>
  async ({ params, request }: LoaderFunctionArgs) => {
    const matterId = parseMatterId(params.matterId);
    if (Number.isNaN(matterId)) return null;
    const filters = filtersFrom(new URL(request.url).searchParams);
    void queryClient.prefetchQuery(documentsQueryOptions(matterId, filters));
    void queryClient.prefetchQuery(custodiansQueryOptions(matterId));
    void queryClient.prefetchQuery(indexStateQueryOptions(matterId));
    void queryClient.prefetchQuery(holdsQueryOptions(matterId));
    return null;
  };

/** Documents: every document of the matter, paged and filtered, with the index state. */
export function DocumentsRoute() {
  const matterId = useMatterId();
  const allowed = useMatterPermission('documents.read');
  if (!allowed) {
    return (
      <Notice tone="warn" title="Not available to your role">
        Your role does not include reading this matter's documents.
      </Notice>
    );
  }
  return <DocumentsPage matterId={matterId} />;
}

const statusOptions = [
  { value: '', label: 'Any status' },
  ...DOCUMENT_STATUSES.map((status) => ({ value: status, label: STATUS_LABELS[status] })),
];

function DocumentsPage({ matterId }: { matterId: number }) {
  const [params, setParams] = useSearchParams();
  const filters = filtersFrom(params);
  const documents = useDocuments(matterId, filters);
  const custodians = useCustodians(matterId);
  const holds = useHolds(matterId);
  const activeHolds = holds.data?.holds.filter((h) => h.active) ?? [];
  const matterHold = activeHolds.find((h) => h.custodian === null);
  const heldCustodians = new Set(activeHolds.flatMap((h) => (h.custodian ? [h.custodian.id] : [])));

  function update(changes: Record<string, string | number | undefined>) {
    const next = new URLSearchParams(params);
    for (const [key, value] of Object.entries(changes)) {
      if (value === undefined || value === '') next.delete(key);
      else next.set(key, String(value));
    }
    setParams(next, { replace: true });
  }

  const custodianOptions = [
    { value: '', label: 'Every custodian' },
    ...(custodians.data?.custodians ?? []).map((c) => ({
      value: String(c.id),
      label: `${c.name} (${c.documentCount})`,
    })),
  ];
  const filtered = filters.status != null || filters.custodian != null || filters.batch != null;

  return (
    <div data-testid="documents-page">
      <PageHeader
        title="Documents"
        description="Every file loaded into the matter, in load order, with what extraction and the index made of it."
        actions={
          <Can permission="documents.upload">
            <Link
              to={`/matters/${matterId}/upload`}
              className="inline-flex h-9 items-center rounded-md border border-accent-strong bg-accent px-3.5 text-sm font-medium text-white hover:bg-accent-strong"
              data-testid="documents-upload-link"
            >
              Upload documents
            </Link>
          </Can>
        }
      />
      {matterHold ? (
        <div className="mb-3" data-testid="matter-hold-banner">
          <Notice tone="warn" title="This matter is under a legal hold">
            No document of this matter can be deleted until the hold is released. Reason:{' '}
            {matterHold.reason}
          </Notice>
        </div>
      ) : null}
      <div className="grid gap-5 2xl:grid-cols-[minmax(0,1fr)_20rem]">
        <div className="min-w-0">
          <div
            className="mb-3 flex flex-wrap items-end gap-3"
            role="group"
            aria-label="Filter the documents"
          >
            <Select
              label="Status"
              className="w-44"
              options={statusOptions}
              value={filters.status ?? ''}
              onChange={(event) => update({ status: event.target.value, page: undefined })}
              data-testid="filter-status"
            />
            <Select
              label="Custodian"
              className="w-60"
              options={custodianOptions}
              value={filters.custodian ? String(filters.custodian) : ''}
              onChange={(event) => update({ custodian: event.target.value, page: undefined })}
              data-testid="filter-custodian"
            />
            {filters.batch ? (
              <span className="flex h-9 items-center gap-2 rounded-md border border-line bg-panel px-2.5 text-[13px]">
                Upload batch {filters.batch}
                <Button
                  size="sm"
                  variant="quiet"
                  onClick={() => update({ batch: undefined, page: undefined })}
                >
                  Show all
                </Button>
              </span>
            ) : null}
            {documents.isFetching && !documents.isPending ? (
              <span className="flex h-9 items-center text-ink-muted">
                <Spinner size="sm" label="Refreshing" />
              </span>
            ) : null}
          </div>
          {documents.isPending ? (
            <SkeletonRows rows={8} label="Loading documents" />
          ) : documents.isError ? (
            <ErrorPanel
              error={documents.error}
              title="The documents could not be loaded"
              onRetry={() => void documents.refetch()}
            />
          ) : documents.data.total === 0 ? (
            <EmptyState
              title={filtered ? 'No document matches these filters' : 'No documents yet'}
              action={
                filtered ? (
                  <Button onClick={() => setParams(new URLSearchParams(), { replace: true })}>
                    Clear the filters
                  </Button>
                ) : (
                  <Can permission="documents.upload">
                    <Link
                      className="font-medium text-accent-strong underline"
                      to={`/matters/${matterId}/upload`}
                    >
                      Upload the first files
                    </Link>
                  </Can>
                )
              }
            >
              {filtered
                ? null
                : 'Files loaded into this matter appear here with their control numbers.'}
            </EmptyState>
          ) : (
            <DocumentTable
              matterId={matterId}
              rows={documents.data.documents}
              total={documents.data.total}
              caption="Documents of this matter"
              heldCustodians={heldCustodians}
              pagination={{ pageIndex: filters.page - 1, pageSize: filters.pageSize }}
              onPaginationChange={(next) =>
                update({
                  page: next.pageIndex > 0 ? next.pageIndex + 1 : undefined,
                  pageSize: next.pageSize === DOCUMENTS_PAGE_DEFAULT ? undefined : next.pageSize,
                })
              }
            />
          )}
        </div>
        <div className="max-w-2xl space-y-5 2xl:max-w-none 2xl:self-start">
          <IndexStatusPanel matterId={matterId} />
          <HoldsPanel matterId={matterId} />
        </div>
      </div>
    </div>
  );
}
