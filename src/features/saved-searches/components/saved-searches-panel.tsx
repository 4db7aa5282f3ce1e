import { type FormEvent, useState } from 'react';
import { Link } from 'react-router-dom';
import { SAVED_SEARCH_NAME_MAX_LENGTH } from '@shared/schemas/saved-searches';
import type { SearchFilters, SearchMode } from '@shared/schemas/search';
import { Button, Notice, SkeletonRows, TextField, describeError } from '@/components/ui';
import { Can, useMatterPermission } from '@/lib/authorization';
import { formatDate } from '@/lib/format';
import { MODE_LABELS, searchHref } from '@/features/search';
import { useCreateSavedSearch } from '../api/create-saved-search';
import { useDeleteSavedSearch } from '../api/delete-saved-search';
import { useSavedSearches } from '../api/get-saved-searches';

/** The matter's saved searches (anyone re-runs them) and a form to save the current one. */
export function SavedSearchesPanel({
  matterId,
  current,
}: {
  matterId: number;
  /** The query on screen, when there is one to save. */
  current: { query: string; mode: SearchMode; filters: SearchFilters } | null;
}) {
  const saved = useSavedSearches(matterId);
  const create = useCreateSavedSearch(matterId);
  const remove = useDeleteSavedSearch(matterId);
  const canSave = useMatterPermission('searches.save');
  const [name, setName] = useState('');

  function submit(event: FormEvent) {
    event.preventDefault();
    if (!current) return;
    create.mutate(
      { name: name.trim(), query: current.query, mode: current.mode, filters: current.filters },
      { onSuccess: () => setName('') },
    );
  }

  return (
    <section
      className="rounded-md border border-line bg-panel p-3"
      aria-labelledby="saved-heading"
      data-testid="saved-searches"
    >
      <h2 id="saved-heading" className="mb-2 text-sm font-semibold">
        Saved searches
      </h2>
      <Can permission="searches.save">
        {current ? (
          <form onSubmit={submit} className="mb-3 space-y-2">
            <TextField
              label="Save this search as"
              value={name}
              maxLength={SAVED_SEARCH_NAME_MAX_LENGTH}
              onChange={(event) => setName(event.target.value)}
              error={create.isError ? describeError(create.error) : null}
              placeholder="e.g. Sheaf payments, first pass"
              data-testid="saved-search-name"
            />
            <Button
              type="submit"
              size="sm"
              busy={create.isPending}
              disabled={!name.trim()}
              data-testid="saved-search-save"
            >
              Save
            </Button>
          </form>
        ) : (
          <p className="mb-2 text-xs text-ink-muted">Run a query to save it here for the team.</p>
        )}
      </Can>
      {saved.isPending ? (
        <SkeletonRows rows={2} label="Loading saved searches" />
      ) : saved.isError ? (
        <Notice tone="danger" title="Saved searches could not be loaded">
          {describeError(saved.error)}
        </Notice>
      ) : saved.data.savedSearches.length === 0 ? (
        <p className="text-xs text-ink-muted">None yet.</p>
      ) : (
        <ul className="divide-y divide-line text-[13px]">
          {saved.data.savedSearches.map((item) => (
            <li key={item.id} className="flex items-start gap-2 py-1.5" data-testid="saved-search">
              <div className="min-w-0 flex-1">
                <Link
                  className="font-medium text-accent-strong hover:underline"
                  to={searchHref(matterId, {
                    query: item.query,
                    mode: item.mode,
                    filters: item.filters,
                    pageIndex: 0,
                    pageSize: 50,
                    savedSearchId: item.id,
                  })}
                >
                  {item.name}
                </Link>
                <p className="truncate text-xs text-ink-muted" title={item.query}>
                  {MODE_LABELS[item.mode]} · “{item.query}”
                </p>
                <p className="text-[11px] text-ink-faint">
                  {item.createdBy?.name ?? 'Former member'} · {formatDate(item.createdAt)}
                </p>
              </div>
              {canSave ? (
                <Button
                  size="sm"
                  variant="quiet"
                  className="text-danger hover:bg-danger-soft"
                  aria-label={`Delete the saved search ${item.name}`}
                  busy={remove.isPending && remove.variables === item.id}
                  onClick={() => remove.mutate(item.id)}
                >
                  Delete
                </Button>
              ) : null}
            </li>
          ))}
        </ul>
      )}
      {remove.isError ? (
        <Notice tone="danger" className="mt-2" title="The saved search was not deleted">
          {describeError(remove.error)}
        </Notice>
      ) : null}
    </section>
  );
}
