import {
  type SortingState,
  type PaginationState,
  type Updater,
  createColumnHelper,
  createSortedRowModel,
  rowPaginationFeature,
  rowSortingFeature,
  sortFn_alphanumeric,
  sortFn_basic,
  sortFn_datetime,
  sortFn_text,
  tableFeatures,
  useTable,
} from '@tanstack/react-table';
import { useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import type { DocumentListItem } from '@shared/schemas/documents';
import { Badge, Button, Notice, Pager, SortableTh, describeError } from '@/components/ui';
import { useMatterPermission } from '@/lib/authorization';
import { formatDate } from '@/lib/format';
import { DeleteDocumentDialog } from './delete-document-dialog';
import { useRetryDocument } from '../api/retry-document';
import { docTypeLabel, formatBytes } from '../format';
import { DocumentStatusCell, IndexStateBadge } from './document-status';

// TanStack Table v9: features are registered explicitly. The server pages the list
// (manualPagination); sorting orders the rows of the page on the client.
const features = tableFeatures({
  rowSortingFeature,
  rowPaginationFeature,
  sortedRowModel: createSortedRowModel(),
  sortFns: {
    alphanumeric: sortFn_alphanumeric,
    text: sortFn_text,
    datetime: sortFn_datetime,
    basic: sortFn_basic,
  },
});

const helper = createColumnHelper<typeof features, DocumentListItem>();

const dataColumns = helper.columns([
  helper.accessor('controlNumber', {
    header: 'Control no.',
    sortFn: 'alphanumeric',
  }),
  helper.accessor('title', { header: 'Title', sortFn: 'text' }),
  helper.accessor((row) => row.custodian?.name ?? '', {
    id: 'custodian',
    header: 'Custodian',
    sortFn: 'text',
  }),
  helper.accessor('docType', { header: 'Type', sortFn: 'text' }),
  helper.accessor((row) => (row.sentAt ? new Date(row.sentAt) : undefined), {
    id: 'date',
    header: 'Date',
    sortFn: 'datetime',
    sortUndefined: 'last',
  }),
  helper.accessor('size', { header: 'Size', sortFn: 'basic' }),
  helper.accessor('status', { header: 'Status', sortFn: 'text' }),
  helper.accessor('indexState', { header: 'Index', sortFn: 'text' }),
]);

// The actions column appears only when the page holds a failed file the role may act on.
const columnsWithActions = [
  ...dataColumns,
  helper.display({ id: 'actions', header: 'Actions', enableSorting: false }),
];

// A fixed layout: every column but the title has a set width and the title takes the rest.
const headerClass: Record<string, string> = {
  controlNumber: 'w-[7.5rem]',
  title: 'min-w-[14rem]',
  custodian: 'w-[9rem]',
  docType: 'w-[5.5rem]',
  date: 'w-[6.5rem]',
  size: 'w-[5rem] text-right',
  status: 'w-[13rem]',
  indexState: 'w-[8rem]',
  actions: 'w-[9rem] text-right',
};

export function DocumentTable({
  matterId,
  rows,
  total,
  pagination,
  onPaginationChange,
  caption,
  heldCustodians,
}: {
  matterId: number;
  /** Custodians under a legal hold (their documents cannot be deleted). */
  heldCustodians?: ReadonlySet<number>;
  rows: DocumentListItem[];
  total: number;
  pagination: PaginationState;
  onPaginationChange: (next: PaginationState) => void;
  caption: string;
}) {
  const navigate = useNavigate();
  const canOrganise = useMatterPermission('documents.organise');
  const [sorting, setSorting] = useState<SortingState>([]);
  const [removing, setRemoving] = useState<DocumentListItem | null>(null);
  const retry = useRetryDocument(matterId);

  const showActions = canOrganise && rows.some((row) => row.status === 'failed');
  const table = useTable({
    features,
    columns: showActions ? columnsWithActions : dataColumns,
    data: rows,
    rowCount: total,
    manualPagination: true,
    getRowId: (row) => String(row.id),
    state: { sorting, pagination },
    onSortingChange: setSorting,
    onPaginationChange: (updater: Updater<PaginationState>) =>
      onPaginationChange(typeof updater === 'function' ? updater(pagination) : updater),
  });

  const controlNumbers = new Map(rows.map((row) => [row.id, row.controlNumber]));
  const open = (row: DocumentListItem) => navigate(`/matters/${matterId}/documents/${row.id}`);

  return (
    <div>
      {retry.isError ? (
        <Notice tone="danger" className="mb-2" title="The document was not queued again">
          {describeError(retry.error)}
        </Notice>
      ) : null}
      <div className="overflow-x-auto rounded-md border border-line bg-panel">
        <table
          className="w-full min-w-[62rem] table-fixed border-collapse text-[13px]"
          data-testid="document-table"
        >
          <caption className="sr-only">{caption}</caption>
          <thead className="bg-sunk/70 text-left">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => (
                  <SortableTh
                    key={header.id}
                    sorted={header.column.getIsSorted()}
                    canSort={header.column.getCanSort()}
                    onToggle={header.column.getToggleSortingHandler()}
                    testId={`sort-${header.column.id}`}
                    className={headerClass[header.column.id]}
                  >
                    <table.FlexRender header={header} />
                  </SortableTh>
                ))}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-line">
            {table.getRowModel().rows.map((row) => {
              const doc = row.original;
              return (
                <tr
                  key={row.id}
                  className="cursor-pointer hover:bg-paper"
                  onClick={() => open(doc)}
                  data-testid="document-row"
                  data-control-number={doc.controlNumber}
                  data-status={doc.status}
                >
                  <td className="px-2.5 py-1 font-mono whitespace-nowrap">
                    <Link
                      to={`/matters/${matterId}/documents/${doc.id}`}
                      className="text-accent-strong underline-offset-2 hover:underline"
                      onClick={(event) => event.stopPropagation()}
                    >
                      {doc.controlNumber}
                    </Link>
                  </td>
                  <td className="px-2.5 py-1">
                    <span className="block truncate" title={doc.path}>
                      {doc.parentId ? (
                        <span className="mr-1 text-ink-faint" aria-label="Attachment:">
                          ↳
                        </span>
                      ) : null}
                      {doc.title}
                    </span>
                  </td>
                  <td className="truncate px-2.5 py-1 text-ink-muted" title={doc.custodian?.name}>
                    {doc.custodian?.name ?? '—'}
                    {doc.custodian && heldCustodians?.has(doc.custodian.id) ? (
                      <span data-testid="custodian-hold-badge" title="Under legal hold">
                        <Badge tone="warn" className="ml-1.5">
                          Legal hold
                        </Badge>
                      </span>
                    ) : null}
                  </td>
                  <td className="px-2.5 py-1 whitespace-nowrap">{docTypeLabel(doc.docType)}</td>
                  <td className="px-2.5 py-1 whitespace-nowrap tabular-nums">
                    {formatDate(doc.sentAt)}
                  </td>
                  <td className="px-2.5 py-1 text-right whitespace-nowrap tabular-nums">
                    {formatBytes(doc.size)}
                  </td>
                  <td className="px-2.5 py-1">
                    <DocumentStatusCell
                      matterId={matterId}
                      status={doc.status}
                      error={doc.error}
                      duplicateOf={doc.duplicateOf}
                      duplicateOfControlNumber={
                        doc.duplicateOf ? controlNumbers.get(doc.duplicateOf) : undefined
                      }
                    />
                  </td>
                  <td className="px-2.5 py-1">
                    <IndexStateBadge state={doc.indexState} />
                  </td>
                  {showActions ? (
                    <td className="px-2.5 py-1 text-right whitespace-nowrap">
                      {doc.status === 'failed' ? (
                        <span
                          className="inline-flex gap-1"
                          onClick={(event) => event.stopPropagation()}
                        >
                          <Button
                            size="sm"
                            variant="quiet"
                            busy={retry.isPending && retry.variables === doc.id}
                            onClick={() => retry.mutate(doc.id)}
                            aria-label={`Retry ${doc.controlNumber}`}
                            data-testid="retry-document"
                          >
                            Retry
                          </Button>
                          <Button
                            size="sm"
                            variant="quiet"
                            className="text-danger hover:bg-danger-soft"
                            onClick={() => setRemoving(doc)}
                            aria-label={`Remove ${doc.controlNumber}`}
                            data-testid="remove-document"
                          >
                            Remove
                          </Button>
                        </span>
                      ) : null}
                    </td>
                  ) : null}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      <Pager
        label="Pages of documents"
        rangeTestId="document-range"
        pageSizes={PAGE_SIZES}
        pageIndex={pagination.pageIndex}
        pageCount={table.getPageCount()}
        pageSize={pagination.pageSize}
        total={total}
        canPrevious={table.getCanPreviousPage()}
        canNext={table.getCanNextPage()}
        onPrevious={() => table.previousPage()}
        onNext={() => table.nextPage()}
        onPageSize={(size) => onPaginationChange({ pageIndex: 0, pageSize: size })}
        note={sorting.length > 0 ? 'sorting orders the rows of this page' : undefined}
      />
      <DeleteDocumentDialog
        matterId={matterId}
        document={removing}
        onClose={() => setRemoving(null)}
      />
    </div>
  );
}

const PAGE_SIZES = [50, 100, 250, 500];
