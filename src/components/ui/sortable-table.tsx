import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { Button } from './button';

export type SortDirection = 'asc' | 'desc' | false;

/**
 * A column header that sorts when the column can: a button with the arrow, and
 * aria-sort for assistive technology (WAI-ARIA 1.2, "aria-sort": set on the one
 * sorted header only). Shared by the documents and search results tables.
 */
export function SortableTh({
  sorted,
  canSort,
  onToggle,
  testId,
  className,
  children,
}: {
  sorted: SortDirection;
  canSort: boolean;
  onToggle?: (event: unknown) => void;
  /** data-testid of the sort button. */
  testId?: string;
  className?: string;
  children: ReactNode;
}) {
  return (
    <th
      scope="col"
      aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
      className={cn(
        'border-b border-line px-2.5 py-1.5 text-[11px] font-semibold tracking-wide text-ink-muted uppercase',
        className,
      )}
    >
      {canSort ? (
        <button
          type="button"
          onClick={onToggle}
          className="inline-flex items-center gap-1 uppercase hover:text-ink"
          data-testid={testId}
        >
          {children}
          <span aria-hidden="true" className="w-2 text-accent-strong">
            {sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : ''}
          </span>
        </button>
      ) : (
        children
      )}
    </th>
  );
}

/** Range, rows-per-page and previous/next for a table the server pages. */
export function Pager({
  label,
  rangeTestId,
  pageIndex,
  pageCount,
  pageSize,
  pageSizes,
  total,
  canPrevious,
  canNext,
  onPrevious,
  onNext,
  onPageSize,
  note,
}: {
  /** The nav's accessible name, e.g. "Pages of documents". */
  label: string;
  rangeTestId?: string;
  pageIndex: number;
  pageCount: number;
  pageSize: number;
  pageSizes: readonly number[];
  total: number;
  canPrevious: boolean;
  canNext: boolean;
  onPrevious: () => void;
  onNext: () => void;
  onPageSize: (size: number) => void;
  /** Said after the range, e.g. that sorting orders only this page. */
  note?: string;
}) {
  const first = total === 0 ? 0 : pageIndex * pageSize + 1;
  const last = Math.min(total, (pageIndex + 1) * pageSize);
  return (
    <nav
      aria-label={label}
      className="mt-2 flex flex-wrap items-center justify-between gap-3 text-[13px] text-ink-muted"
    >
      <span aria-live="polite" data-testid={rangeTestId}>
        {first}–{last} of {total}
        {note ? ` · ${note}` : ''}
      </span>
      <span className="flex items-center gap-2">
        <label className="flex items-center gap-1.5">
          Rows per page
          <select
            className="h-7 rounded-md border border-line-strong bg-panel px-1.5 text-[13px] text-ink"
            value={pageSize}
            onChange={(event) => onPageSize(Number(event.target.value))}
          >
            {pageSizes.map((size) => (
              <option key={size} value={size}>
                {size}
              </option>
            ))}
          </select>
        </label>
        <Button size="sm" onClick={onPrevious} disabled={!canPrevious}>
          Previous
        </Button>
        <span className="tabular-nums">
          Page {pageCount === 0 ? 0 : pageIndex + 1} of {pageCount}
        </span>
        <Button size="sm" onClick={onNext} disabled={!canNext}>
          Next
        </Button>
      </span>
    </nav>
  );
}
