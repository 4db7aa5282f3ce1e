import { Link } from 'react-router-dom';
import { SEARCH_PAGE_DEFAULT } from '@shared/schemas/search';
import { Notice, SkeletonRows, describeError } from '@/components/ui';
import { formatDateTime } from '@/lib/format';
import { useRecentSearches } from '../api/get-recent-searches';
import { MODE_LABELS, searchHref } from '../search-state';

/** At most this many lines, so the panel never grows past the query card. */
export const RECENT_SHOWN = 8;

/** The signed-in person's last searches on this matter (from the audit log), one line each. */
export function RecentSearchesPanel({ matterId }: { matterId: number }) {
  const recent = useRecentSearches(matterId);
  return (
    <section
      className="rounded-md border border-line bg-panel p-3"
      aria-labelledby="recent-heading"
      data-testid="recent-searches"
    >
      <h2 id="recent-heading" className="mb-2 text-sm font-semibold">
        Your recent searches
      </h2>
      {recent.isPending ? (
        <SkeletonRows rows={3} label="Loading recent searches" />
      ) : recent.isError ? (
        <Notice tone="danger" title="Recent searches could not be loaded">
          {describeError(recent.error)}
        </Notice>
      ) : recent.data.searches.length === 0 ? (
        <p className="text-xs text-ink-muted">Searches you run appear here.</p>
      ) : (
        <ul className="space-y-1 text-[13px]">
          {recent.data.searches.slice(0, RECENT_SHOWN).map((item, index) => (
            <li
              key={`${item.at}-${index}`}
              className="flex min-w-0 items-baseline gap-2"
              title={`${MODE_LABELS[item.mode]} · ${item.hits} hits · ${formatDateTime(item.at)}`}
              data-testid="recent-search"
            >
              {item.query || item.similarToDocumentId ? (
                <Link
                  className="min-w-0 flex-1 truncate text-accent-strong hover:underline"
                  to={searchHref(matterId, {
                    query: item.query,
                    mode: item.mode,
                    filters: item.filters,
                    pageIndex: 0,
                    pageSize: SEARCH_PAGE_DEFAULT,
                    likeDocumentId: item.similarToDocumentId ?? undefined,
                  })}
                >
                  {item.query ? `“${item.query}”` : 'More like this document'}
                </Link>
              ) : (
                // The passage itself is not kept in the log, so it cannot be re-run from here.
                <span className="min-w-0 flex-1 truncate text-ink-muted">
                  More like a selected passage
                </span>
              )}
              <span className="shrink-0 text-[11px] text-ink-faint tabular-nums">
                {item.hits.toLocaleString()} hits
              </span>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
