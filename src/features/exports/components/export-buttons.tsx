import type { SearchFilters, SearchMode, SearchSort } from '@shared/schemas/search';
import { Can } from '@/lib/authorization';
import { privilegeLogCsvHref, resultsCsvHref } from '../api/export-links';

const linkClass =
  'inline-flex h-9 items-center gap-1.5 rounded-md border border-line-strong bg-panel px-3.5 text-sm font-medium text-ink hover:bg-sunk';

/** CSV downloads for roles holding exports.create (lead, attorney); the server audits each. */
export function ExportButtons({
  matterId,
  search,
}: {
  matterId: number;
  /** The query on screen; without one only the privilege log is offered. */
  search: { query: string; mode: SearchMode; filters: SearchFilters; sort?: SearchSort } | null;
}) {
  return (
    <Can permission="exports.create">
      <span className="flex flex-wrap gap-2" data-testid="export-buttons">
        {search ? (
          <a
            className={linkClass}
            href={resultsCsvHref(matterId, search)}
            download
            data-testid="export-results"
          >
            Results CSV
          </a>
        ) : null}
        <a
          className={linkClass}
          href={privilegeLogCsvHref(matterId)}
          download
          data-testid="export-privilege-log"
        >
          Privilege log CSV
        </a>
      </span>
    </Can>
  );
}
