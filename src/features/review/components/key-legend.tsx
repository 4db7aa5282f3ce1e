import { useState } from 'react';
import type { Code } from '@/features/codes/api/get-codes';
import { NAVIGATION_KEYS } from '../keyboard';

export function Kbd({ children }: { children: string }) {
  return (
    <kbd className="inline-flex min-w-5 items-center justify-center rounded border border-line-strong border-b-2 bg-panel px-1 font-mono text-[11px] leading-4 text-ink">
      {children}
    </kbd>
  );
}

const FOLD_KEY = 'quarry.keyLegend.open';

/** Open or folded, remembered in this browser. */
export function useLegendOpen(): [boolean, (open: boolean | ((o: boolean) => boolean)) => void] {
  const [open, setOpen] = useState(() => {
    try {
      return window.localStorage.getItem(FOLD_KEY) !== 'false';
    } catch {
      return true;
    }
  });
  return [
    open,
    (next) =>
      setOpen((was) => {
        const value = typeof next === 'function' ? next(was) : next;
        try {
          window.localStorage.setItem(FOLD_KEY, String(value));
        } catch {
          // Private windows may refuse storage; the legend still folds for this page.
        }
        return value;
      }),
  ];
}

/** The viewer's keyboard map; folds away to its heading. Keys do nothing in a field. */
export function KeyLegend({
  keyMap,
  hasPosition,
  open,
  onToggle,
}: {
  keyMap: Map<string, Code>;
  hasPosition: boolean;
  open: boolean;
  onToggle: () => void;
}) {
  return (
    <section
      className="rounded-md border border-line bg-panel p-3 text-[13px]"
      aria-labelledby="keys-heading"
      data-testid="key-legend"
      data-open={open ? 'true' : 'false'}
    >
      <h2 id="keys-heading" className="text-sm font-semibold">
        <button
          type="button"
          onClick={onToggle}
          aria-expanded={open}
          className="flex w-full items-center justify-between"
          data-testid="key-legend-toggle"
        >
          Keys{' '}
          <span className="text-xs font-normal text-ink-muted">{open ? 'Hide' : 'Show'} (?)</span>
        </button>
      </h2>
      {open ? (
        <>
          <dl className="mt-1.5 grid grid-cols-[4.5rem_minmax(0,1fr)] gap-x-2 gap-y-1">
            {NAVIGATION_KEYS.filter(
              (entry) =>
                hasPosition || !['Next document', 'Previous document'].includes(entry.action),
            ).map((entry) => (
              <div key={entry.action} className="contents">
                <dt className="flex gap-1">
                  {entry.keys.map((key) => (
                    <Kbd key={key}>{key}</Kbd>
                  ))}
                </dt>
                <dd className="text-ink-muted">{entry.action}</dd>
              </div>
            ))}
            {[...keyMap].map(([key, code]) => (
              <div key={key} className="contents">
                <dt>
                  <Kbd>{key}</Kbd>
                </dt>
                <dd className="text-ink-muted">Choose or remove {code.name}</dd>
              </div>
            ))}
          </dl>
          <p className="mt-2 text-xs text-ink-faint">
            In a one-choice group a key replaces the group's code. Keys are ignored while you type
            in a field.
          </p>
        </>
      ) : null}
    </section>
  );
}
