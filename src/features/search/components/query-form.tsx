import { type FormEvent, type KeyboardEvent, useEffect, useId, useState } from 'react';
import { SEARCH_MODES, type SearchMode } from '@shared/schemas/search';
import { QUERY_MAX_LENGTH } from '@shared/limits';
import { Button } from '@/components/ui';
import { cn } from '@/lib/cn';
import { MODE_EXPLANATIONS, MODE_LABELS } from '../search-state';
import { SyntaxHelp } from './syntax-help';

/** The query box (a word, a sentence or a pasted paragraph) and the mode switch. */
export function QueryForm({
  query,
  mode,
  busy,
  serverError,
  onSubmit,
}: {
  query: string;
  mode: SearchMode;
  busy: boolean;
  /** The server's message for a malformed query (with its position), shown under the box. */
  serverError?: string | null;
  /** Runs the search; a mode change alone runs it too when there is a query. */
  onSubmit: (query: string, mode: SearchMode) => void;
}) {
  const [draft, setDraft] = useState(query);
  const [error, setError] = useState<string | null>(null);
  const boxId = useId();
  const modeName = useId();

  // The switch shows the choice at once; the address bar (the source of truth) follows.
  const [selected, setSelected] = useState(mode);

  // A saved search, a refinement or the back button changes the query from outside.
  useEffect(() => setDraft(query), [query]);
  useEffect(() => setSelected(mode), [mode]);

  function run(nextMode: SearchMode) {
    const text = draft.trim();
    if (!text) {
      setError('Type a word, a sentence or a paragraph to search for.');
      return;
    }
    if (text.length > QUERY_MAX_LENGTH) {
      setError(`The query is ${text.length} characters; the most is ${QUERY_MAX_LENGTH}.`);
      return;
    }
    setError(null);
    onSubmit(text, nextMode);
  }

  function submit(event: FormEvent) {
    event.preventDefault();
    run(selected);
  }

  function onKeyDown(event: KeyboardEvent<HTMLTextAreaElement>) {
    // Enter runs the search; Shift+Enter starts a new line (a pasted paragraph keeps its).
    if (event.key === 'Enter' && !event.shiftKey && !event.nativeEvent.isComposing) {
      event.preventDefault();
      run(selected);
    }
  }

  // The server's syntax error applies to the query it ran; editing the box hides it.
  const shownError = error ?? (draft.trim() === query.trim() ? (serverError ?? null) : null);

  return (
    <form onSubmit={submit} className="space-y-3" role="search" aria-label="Search the matter">
      <div className="space-y-1">
        <label htmlFor={boxId} className="block text-[13px] font-medium text-ink">
          Search for
        </label>
        <textarea
          id={boxId}
          value={draft}
          onChange={(event) => setDraft(event.target.value)}
          onKeyDown={onKeyDown}
          rows={draft.length > 160 ? 5 : 2}
          placeholder="A word, a sentence, or a paragraph pasted from a document"
          aria-invalid={shownError ? true : undefined}
          aria-describedby={`${boxId}-hint${shownError ? ` ${boxId}-error` : ''}`}
          className="block w-full resize-y rounded-md border border-line-strong bg-panel px-3 py-2 font-document text-[15px] leading-snug text-ink placeholder:font-sans placeholder:text-sm placeholder:text-ink-faint aria-[invalid=true]:border-danger"
          data-testid="search-query"
        />
        {shownError ? (
          <p
            id={`${boxId}-error`}
            className="text-xs font-medium text-danger"
            role="alert"
            data-testid="search-query-error"
          >
            {shownError}
          </p>
        ) : null}
        <SyntaxHelp />
      </div>
      <div className="flex flex-wrap items-stretch gap-3">
        <fieldset className="min-w-0 flex-1">
          <legend className="mb-1 text-[13px] font-medium text-ink">Mode</legend>
          <div className="grid gap-1.5 sm:grid-cols-3" data-testid="search-mode">
            {SEARCH_MODES.map((value) => (
              <label
                key={value}
                className={cn(
                  'cursor-pointer rounded-md border px-2.5 py-1.5 text-xs leading-snug',
                  value === selected
                    ? 'border-accent bg-accent-soft text-ink ring-1 ring-accent'
                    : 'border-line bg-panel text-ink-muted hover:border-line-strong',
                )}
              >
                <span className="flex items-center gap-1.5 text-[13px] font-semibold text-ink">
                  <input
                    type="radio"
                    name={modeName}
                    value={value}
                    checked={value === selected}
                    onChange={() => {
                      setSelected(value);
                      if (draft.trim()) run(value);
                      else onSubmit('', value);
                    }}
                    className="accent-accent"
                    data-testid={`mode-${value}`}
                  />
                  {MODE_LABELS[value]}
                  {value === 'hybrid' ? (
                    <span className="font-normal text-ink-faint">(default)</span>
                  ) : null}
                </span>
                <span className="mt-0.5 block">{MODE_EXPLANATIONS[value]}</span>
              </label>
            ))}
          </div>
        </fieldset>
        <div className="flex flex-col justify-end gap-1">
          <Button type="submit" variant="primary" busy={busy} data-testid="search-run">
            Search
          </Button>
          <span id={`${boxId}-hint`} className="text-center text-[11px] text-ink-faint">
            <kbd className="font-mono">Enter</kbd> runs it, <kbd className="font-mono">Shift</kbd>+
            <kbd className="font-mono">Enter</kbd> new line
          </span>
        </div>
      </div>
    </form>
  );
}
