import { Button } from '@/components/ui';
import { PAGE_SIZES } from '../search-state';

export function ResultsPager({
  pageIndex,
  pageSize,
  total,
  onPage,
  onPageSize,
}: {
  pageIndex: number;
  pageSize: number;
  total: number;
  onPage: (pageIndex: number) => void;
  onPageSize: (size: number) => void;
}) {
  const pageCount = Math.max(1, Math.ceil(total / pageSize));
  const first = total === 0 ? 0 : pageIndex * pageSize + 1;
  const last = Math.min(total, (pageIndex + 1) * pageSize);
  return (
    <nav
      aria-label="Pages of results"
      className="mt-2 flex flex-wrap items-center justify-between gap-3 text-[13px] text-ink-muted"
    >
      <span aria-live="polite" data-testid="results-range">
        {first}–{last} of {total.toLocaleString()}
      </span>
      <span className="flex items-center gap-2">
        <label className="flex items-center gap-1.5">
          Rows per page
          <select
            className="h-7 rounded-md border border-line-strong bg-panel px-1.5 text-[13px] text-ink"
            value={pageSize}
            onChange={(event) => onPageSize(Number(event.target.value))}
          >
            {PAGE_SIZES.map((size) => (
              <option key={size} value={size}>
                {size}
              </option>
            ))}
          </select>
        </label>
        <Button
          size="sm"
          onClick={() => onPage(pageIndex - 1)}
          disabled={pageIndex === 0}
          data-testid="results-previous"
        >
          Previous
        </Button>
        <span className="tabular-nums">
          Page {pageIndex + 1} of {pageCount}
        </span>
        <Button
          size="sm"
          onClick={() => onPage(pageIndex + 1)}
          disabled={pageIndex + 1 >= pageCount}
          data-testid="results-next"
        >
          Next
        </Button>
      </span>
    </nav>
  );
}
