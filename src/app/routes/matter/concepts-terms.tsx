import { type FormEvent, useId, useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import {
  NEIGHBOURS_DEFAULT,
  NEIGHBOURS_MAX,
  TERM_QUERY_MAX_LENGTH,
  type NeighboursQuery,
} from '@shared/schemas/concepts';
import { Button, EmptyState, Notice, Select, SkeletonRows, inputClass } from '@/components/ui';
import {
  type NeighboursResponse,
  useTermNeighbours,
} from '@/features/concepts/api/get-term-neighbours';
import { ValueBar } from '@/features/concepts/components/loading-bar';
import { formatCount } from '@/features/concepts/format';
import { useMatterPermission } from '@/lib/authorization';
import { ConceptQuery } from '@/features/concepts/components/concept-query';
import { ConceptViewForbidden } from './concepts';
import { useMatterId } from './layout';

const COUNTS = [10, NEIGHBOURS_DEFAULT, 50, NEIGHBOURS_MAX];

function queryFrom(params: URLSearchParams): NeighboursQuery | null {
  const term = (params.get('term') ?? '').trim().slice(0, TERM_QUERY_MAX_LENGTH);
  const n = Number(params.get('n'));
  if (!term) return null;
  return { term, n: COUNTS.includes(n) ? n : NEIGHBOURS_DEFAULT };
}

/**
 * The search page reads its query from ?q= and its mode from ?mode=
 * (src/features/search/search-state.ts).
 */
export function searchHrefFor(matterId: number, words: string[]): string {
  const params = new URLSearchParams({ q: words.join(' '), mode: 'concept' });
  return `/matters/${matterId}/search?${params.toString()}`;
}

/** Term neighbours: the matter's vocabulary around a word (code names, euphemisms, misspellings). */
export function ConceptsTermsRoute() {
  const matterId = useMatterId();
  if (!useMatterPermission('concepts.view')) return <ConceptViewForbidden />;
  return <TermsPage matterId={matterId} />;
}

function TermsPage({ matterId }: { matterId: number }) {
  const inputId = useId();
  const [params, setParams] = useSearchParams();
  const query = queryFrom(params);
  const [draft, setDraft] = useState(query?.term ?? '');
  const neighbours = useTermNeighbours(matterId, query);

  function submit(event: FormEvent) {
    event.preventDefault();
    const term = draft.trim();
    if (!term) return;
    const next = new URLSearchParams({ term });
    if (query && query.n !== NEIGHBOURS_DEFAULT) next.set('n', String(query.n));
    setParams(next);
  }

  return (
    <div data-testid="concepts-terms" className="space-y-4">
      <form onSubmit={submit} role="search" className="flex flex-wrap items-end gap-3">
        <div className="w-80 space-y-1">
          <label htmlFor={inputId} className="block text-[13px] font-medium">
            Term
          </label>
          <input
            id={inputId}
            type="search"
            value={draft}
            maxLength={TERM_QUERY_MAX_LENGTH}
            onChange={(event) => setDraft(event.target.value)}
            placeholder="e.g. shredding"
            className={inputClass}
            data-testid="neighbours-term"
          />
        </div>
        <Select
          label="Neighbours"
          className="w-32"
          options={COUNTS.map((n) => ({ value: String(n), label: String(n) }))}
          value={String(query?.n ?? NEIGHBOURS_DEFAULT)}
          onChange={(event) => {
            const next = new URLSearchParams(params);
            next.set('n', event.target.value);
            setParams(next, { replace: true });
          }}
        />
        <Button
          type="submit"
          variant="primary"
          disabled={!draft.trim()}
          data-testid="neighbours-submit"
        >
          Find nearest terms
        </Button>
      </form>
      <p className="max-w-prose text-[13px] text-ink-muted">
        Terms whose use across the matter&apos;s documents resembles the word&apos;s, measured by
        the cosine between their concept vectors (rows of U<sub>k</sub>S<sub>k</sub>): 1 means the
        same direction, 0 unrelated. Useful for finding code names, euphemisms and misspellings to
        add to a search.
      </p>
      {query == null ? (
        <EmptyState title="Type a term to see its neighbours" />
      ) : (
        <ConceptQuery
          query={neighbours}
          errorTitle="The neighbours could not be found"
          loading={<SkeletonRows rows={8} label="Finding the nearest terms" />}
        >
          {(data) => (
            <NeighboursResult
              key={`${data.indexId}-${data.query}`}
              matterId={matterId}
              data={data}
            />
          )}
        </ConceptQuery>
      )}
    </div>
  );
}

function NeighboursResult({ matterId, data }: { matterId: number; data: NeighboursResponse }) {
  // Every neighbour starts ticked for the search; untick the ones that are noise.
  const [unticked, setUnticked] = useState<Set<string>>(() => new Set());
  const chosen = data.neighbours.filter((n) => !unticked.has(n.term)).map((n) => n.label);
  const words = [data.query, ...chosen.filter((label) => label !== data.query)];
  const max = Math.max(...data.neighbours.map((n) => Math.abs(n.similarity)), 0);

  return (
    <section aria-label={`Nearest terms to ${data.query}`} className="space-y-3">
      {data.notice ? <Notice tone="warn">{data.notice}</Notice> : null}
      <p className="text-[13px] text-ink-muted">
        “{data.query}” is analysed as{' '}
        {data.analysed.length ? (
          data.analysed.map((stem) => (
            <code key={stem} className="mr-1 rounded bg-sunk px-1 font-mono text-xs">
              {stem}
            </code>
          ))
        ) : (
          <em>no index term</em>
        )}
        {data.unknown.length ? ` (not in the index: ${data.unknown.join(', ')})` : ''}. Version{' '}
        {data.version}.
      </p>
      {data.neighbours.length === 0 ? (
        <EmptyState title="No neighbours">None of the words is in the serving index.</EmptyState>
      ) : (
        <>
          <div className="flex flex-wrap items-center gap-3 rounded-md border border-line bg-panel px-3 py-2">
            <Link
              to={searchHrefFor(matterId, words)}
              className="inline-flex h-8 items-center rounded-md border border-accent-strong bg-accent px-3 text-[13px] font-medium text-white hover:bg-accent-strong"
              data-testid="neighbours-search"
            >
              Search with these {words.length} terms
            </Link>
            <span className="text-[13px] text-ink-muted">
              A concept search for “{data.query}” and the ticked neighbours.
            </span>
          </div>
          <table className="w-full max-w-3xl text-sm" data-testid="neighbours-table">
            <caption className="sr-only">Nearest terms with their cosine similarity</caption>
            <thead>
              <tr className="text-left text-xs tracking-wide text-ink-muted uppercase">
                <th scope="col" className="w-10 py-1 font-semibold">
                  <span className="sr-only">Include in the search</span>
                </th>
                <th scope="col" className="py-1 font-semibold">
                  Term and similarity
                </th>
                <th scope="col" className="w-24 py-1 text-right font-semibold">
                  Documents
                </th>
                <th scope="col" className="w-20 py-1">
                  <span className="sr-only">Search for this term</span>
                </th>
              </tr>
            </thead>
            <tbody className="divide-y divide-line">
              {data.neighbours.map((n) => (
                <tr key={n.term} data-testid="neighbour-row" data-term={n.term}>
                  <td className="py-1">
                    <input
                      type="checkbox"
                      className="size-4 accent-accent"
                      checked={!unticked.has(n.term)}
                      aria-label={`Include ${n.label} in the search`}
                      onChange={(event) =>
                        setUnticked((previous) => {
                          const next = new Set(previous);
                          if (event.target.checked) next.delete(n.term);
                          else next.add(n.term);
                          return next;
                        })
                      }
                    />
                  </td>
                  <td className="py-1" title={n.label === n.term ? undefined : `stem: ${n.term}`}>
                    <ValueBar label={n.label} value={n.similarity} max={max} />
                  </td>
                  <td className="py-1 text-right text-[13px] text-ink-muted tabular-nums">
                    {formatCount(n.df)}
                  </td>
                  <td className="py-1 text-right">
                    <Link
                      to={searchHrefFor(matterId, [n.label])}
                      className="text-[13px] text-accent-strong underline-offset-2 hover:underline"
                    >
                      Search
                    </Link>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </>
      )}
    </section>
  );
}
