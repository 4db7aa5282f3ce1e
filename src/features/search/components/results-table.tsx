import {
  type RowSelectionState,
  type SortingState,
  type Updater,
  createColumnHelper,
  rowPaginationFeature,
  rowSelectionFeature,
  rowSortingFeature,
  tableFeatures,
  useTable,
} from '@tanstack/react-table';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import type { SearchHit, SearchSort, SortField } from '@shared/schemas/search';
import { Badge } from '@/components/ui';
import { cn } from '@/lib/cn';
import { formatDate } from '@/lib/format';
import { docTypeLabel } from '@/features/documents';
import { Snippet } from './highlight';
import { ScoreBar } from './score-bar';

// TanStack Table v9 with its features named explicitly. The server sorts and pages the
// whole result set (manualSorting, manualPagination); the table keeps the selection,
// keyed by document id so it survives paging.
const features = tableFeatures({ rowSortingFeature, rowPaginationFeature, rowSelectionFeature });
const helper = createColumnHelper<typeof features, SearchHit>();

const columns = helper.columns([
  helper.display({ id: 'select', header: 'Select', enableSorting: false }),
  helper.accessor('controlNumber', { header: 'Control no.' }),
  helper.accessor('title', { header: 'Title and snippet' }),
  helper.accessor((hit) => hit.custodian ?? '', { id: 'custodian', header: 'Custodian' }),
  helper.accessor((hit) => hit.sentAt ?? '', { id: 'date', header: 'Date' }),
  helper.accessor('docType', { header: 'Type' }),
  helper.accessor('score', { header: 'Score' }),
  helper.display({ id: 'codes', header: 'Codes', enableSorting: false }),
]);

const headerClass: Record<string, string> = {
  select: 'w-9',
  controlNumber: 'w-[7.5rem]',
  title: '',
  // Narrow metadata columns leave the snippet most of the row.
  custodian: 'w-[7.5rem]',
  date: 'w-[6.5rem]',
  docType: 'w-[5rem]',
  score: 'w-[6.5rem]',
  codes: 'w-[8rem]',
};

function toSorting(sort: SearchSort | undefined): SortingState {
  return sort ? [{ id: sort.field, desc: sort.direction === 'desc' }] : [];
}

export function ResultsTable({
  hits,
  total,
  pageIndex,
  pageSize,
  sort,
  onSortChange,
  rowSelection,
  onRowSelectionChange,
  canSelect,
  hrefFor,
}: {
  hits: SearchHit[];
  total: number;
  pageIndex: number;
  pageSize: number;
  sort: SearchSort | undefined;
  onSortChange: (sort: SearchSort | undefined) => void;
  rowSelection: RowSelectionState;
  onRowSelectionChange: (next: RowSelectionState) => void;
  canSelect: boolean;
  /** The viewer's address for the hit at `index` on this page. */
  hrefFor: (hit: SearchHit, index: number) => string;
}) {
  const sorting = toSorting(sort);
  const table = useTable({
    features,
    columns,
    data: hits,
    rowCount: total,
    manualSorting: true,
    manualPagination: true,
    enableRowSelection: canSelect,
    enableSortingRemoval: true,
    getRowId: (hit) => String(hit.documentId),
    state: { sorting, rowSelection, pagination: { pageIndex, pageSize } },
    onSortingChange: (updater: Updater<SortingState>) => {
      const next = typeof updater === 'function' ? updater(sorting) : updater;
      const first = next[0];
      onSortChange(
        first
          ? { field: first.id as SortField, direction: first.desc ? 'desc' : 'asc' }
          : undefined,
      );
    },
    onRowSelectionChange: (updater: Updater<RowSelectionState>) =>
      onRowSelectionChange(typeof updater === 'function' ? updater(rowSelection) : updater),
  });

  const rows = table.getRowModel().rows;
  const pageSelected = rows.filter((row) => rowSelection[row.id]).length;

  return (
    <div className="overflow-x-auto rounded-md border border-line bg-panel">
      <table
        className="w-full min-w-[64rem] table-fixed border-collapse text-[13px]"
        data-testid="results-table"
      >
        <caption className="sr-only">Search results, ranked</caption>
        <thead className="bg-sunk/70 text-left">
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id}>
              {group.headers.map((header) => {
                const id = header.column.id;
                if (id === 'select') {
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      className="w-9 border-b border-line px-2.5 py-1.5"
                    >
                      {canSelect ? (
                        <input
                          type="checkbox"
                          aria-label="Select every row on this page"
                          className="size-4 accent-accent"
                          checked={rows.length > 0 && pageSelected === rows.length}
                          ref={(el) => {
                            if (el)
                              el.indeterminate = pageSelected > 0 && pageSelected < rows.length;
                          }}
                          onChange={(event) =>
                            table.toggleAllPageRowsSelected(event.target.checked)
                          }
                          data-testid="select-page"
                        />
                      ) : (
                        <span className="sr-only">Select</span>
                      )}
                    </th>
                  );
                }
                // With no explicit sort the server ranks by score, best first.
                const sorted =
                  header.column.getIsSorted() || (id === 'score' && !sort ? 'desc' : false);
                const canSort = header.column.getCanSort();
                return (
                  <th
                    key={header.id}
                    scope="col"
                    aria-sort={
                      sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined
                    }
                    className={cn(
                      'border-b border-line px-2.5 py-1.5 text-[11px] font-semibold tracking-wide text-ink-muted uppercase',
                      headerClass[id],
                    )}
                  >
                    {canSort ? (
                      <button
                        type="button"
                        onClick={header.column.getToggleSortingHandler()}
                        className="inline-flex items-center gap-1 uppercase hover:text-ink"
                        data-testid={`sort-${id}`}
                      >
                        <table.FlexRender header={header} />
                        <span aria-hidden="true" className="w-2 text-accent-strong">
                          {sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : ''}
                        </span>
                      </button>
                    ) : (
                      <table.FlexRender header={header} />
                    )}
                  </th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody className="divide-y divide-line">
          {rows.map((row, index) => {
            const hit = row.original;
            const selected = Boolean(rowSelection[row.id]);
            const href = hrefFor(hit, index);
            return (
              <tr
                key={row.id}
                className={cn('align-top', selected ? 'bg-accent-soft/60' : 'hover:bg-paper')}
                data-testid="result-row"
                data-control-number={hit.controlNumber}
                data-document-id={hit.documentId}
              >
                <td className="px-2.5 py-2">
                  {canSelect ? (
                    <input
                      type="checkbox"
                      className="mt-0.5 size-4 accent-accent"
                      aria-label={`Select ${hit.controlNumber}`}
                      checked={selected}
                      onChange={(event) => row.toggleSelected(event.target.checked)}
                      data-testid="select-row"
                    />
                  ) : null}
                </td>
                <td className="px-2.5 py-2 font-mono whitespace-nowrap">
                  <Link
                    to={href}
                    className="text-accent-strong underline-offset-2 hover:underline"
                    data-testid="result-open"
                  >
                    {hit.controlNumber}
                  </Link>
                  <span className="mt-0.5 block text-[11px] text-ink-faint">#{hit.rank}</span>
                </td>
                <td className="px-2.5 py-2">
                  <Link
                    to={href}
                    tabIndex={-1}
                    className="block truncate font-medium text-ink hover:underline"
                    title={hit.title}
                  >
                    {hit.parentId ? (
                      <span className="mr-1 text-ink-faint" aria-label="Attachment:">
                        ↳
                      </span>
                    ) : null}
                    {hit.title || '(untitled)'}
                  </Link>
                  {hit.duplicateOf ? (
                    <span className="text-[11px] text-ink-muted">
                      Exact copy of another document
                    </span>
                  ) : null}
                  <RowDetail hit={hit} />
                </td>
                <td
                  className="truncate px-2.5 py-2 text-ink-muted"
                  title={hit.custodian ?? undefined}
                >
                  {hit.custodian ?? '—'}
                </td>
                <td className="px-2.5 py-2 whitespace-nowrap tabular-nums">
                  {formatDate(hit.sentAt)}
                </td>
                <td className="px-2.5 py-2 whitespace-nowrap">{docTypeLabel(hit.docType)}</td>
                <td className="px-2.5 py-2">
                  <ScoreBar score={hit.score} rawScore={hit.rawScore} />
                </td>
                <td className="px-2.5 py-2">
                  <span className="flex flex-wrap gap-1" data-testid="hit-codes">
                    {hit.codes.length === 0 ? (
                      <span className="text-ink-faint">—</span>
                    ) : (
                      hit.codes.map((code) => (
                        <Badge key={code.id} tone="accent">
                          {code.name}
                        </Badge>
                      ))
                    )}
                  </span>
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}

/** Two lines of snippet; the whole snippet and why it matched on demand (compact rows). */
function RowDetail({ hit }: { hit: SearchHit }) {
  const [open, setOpen] = useState(false);
  return (
    <>
      <Snippet segments={hit.snippet} className={cn('mt-1', open ? '' : 'line-clamp-2')} />
      {open ? <WhyMatched hit={hit} /> : null}
      <button
        type="button"
        className="mt-0.5 text-[11px] text-ink-muted hover:text-ink hover:underline"
        aria-expanded={open}
        onClick={() => setOpen(!open)}
        data-testid="row-more"
      >
        {open ? 'Less' : 'More: whole snippet, why it matched'}
      </button>
    </>
  );
}

/** The terms carrying most of the hit's score. */
function WhyMatched({ hit }: { hit: SearchHit }) {
  const { topTerms } = hit.why;
  if (topTerms.length === 0) return null;
  return (
    <p className="mt-1 text-xs text-ink-muted" data-testid="why-matched">
      <span className="font-semibold text-ink">Why it matched:</span>{' '}
      {topTerms.slice(0, 6).map((t, i) => (
        <span key={t.term} title={`weight ${t.weight.toFixed(3)}`}>
          {i > 0 ? ', ' : ''}
          {t.term}
        </span>
      ))}
    </p>
  );
}

/**
 * The query's nearest terms in the concept space, gathered over the page's hits, each a
 * one-click refinement (added to the query, which runs again).
 */
export function RefineBar({
  hits,
  onRefine,
}: {
  hits: SearchHit[];
  onRefine: (term: string) => void;
}) {
  const best = new Map<string, number>();
  for (const hit of hits)
    for (const t of hit.why.nearestQueryTerms)
      best.set(t.term, Math.max(best.get(t.term) ?? -1, t.similarity));
  const terms = [...best].sort((a, b) => b[1] - a[1]).slice(0, 10);
  if (terms.length === 0) return null;
  return (
    <p className="flex flex-wrap items-center gap-1.5 text-[13px]" data-testid="refine-bar">
      <span className="font-semibold text-ink">Near your query in the concept space:</span>
      {terms.map(([term, similarity]) => (
        <button
          key={term}
          type="button"
          onClick={() => onRefine(term)}
          className="rounded border border-line-strong bg-panel px-1.5 leading-6 text-accent-strong hover:bg-accent-soft"
          title={`Add “${term}” to the query and run it again (similarity ${similarity.toFixed(2)})`}
          data-testid="refine-term"
        >
          + {term}
        </button>
      ))}
    </p>
  );
}
